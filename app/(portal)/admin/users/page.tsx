import { redirect } from "next/navigation";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { listUsers, USER_LIST } from "@/lib/people/queries";
import { nextHref, PAGE_SIZE } from "@/lib/http/page";
import { listOrganisations } from "@/lib/people/queries-organisations";
import { PageHeader } from "@/components/ui/page-header";
import { Section } from "@/components/ui/section";
import { ROLE_HOME } from "@/components/portal/nav";
import { PASSWORD_MIN_LENGTH } from "@/lib/auth/password-rules";
import { UsersTable } from "./users-table";
import { CreateUserForm } from "./create-user-form";

export const metadata = { title: "Users" };

export default async function AdminUsersPage() {
  const user = await requireUser();
  if (!can(user.role, "user.manage")) redirect(ROLE_HOME[user.role]);
  const [page, orgs] = await Promise.all([listUsers(user, { limit: PAGE_SIZE }), listOrganisations(user)]);
  return (
    <>
      <PageHeader
        eyebrow="Administration"
        title="Users"
        description="Everyone who can sign in. A deactivated account cannot sign in, and its open sessions end at their next request."
      />
      <Section id="users" title="All users">
        <UsersTable
          currentUserId={user.id}
          pageSize={PAGE_SIZE}
          first={{
            data: page.rows.map((u) => ({
              id: u.id,
              name: u.name,
              email: u.email,
              role: u.role,
              organisationName: u.organisationName,
              active: u.active,
              createdAt: u.createdAt.toISOString(),
            })),
            // the following pages come from the API, in the same order
            next: nextHref("/api/v1/admin/users", new URLSearchParams(), USER_LIST, page),
          }}
        />
      </Section>
      <Section
        id="create"
        title="Create a user"
        note="Give the new user their password by a safe route; they can change it under Settings."
      >
        <CreateUserForm
          organisations={orgs.map((o) => ({ id: o.id, name: o.name, kind: o.kind }))}
          passwordMinLength={PASSWORD_MIN_LENGTH}
        />
      </Section>
    </>
  );
}
