import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { InviteForm } from "@/components/settings/invite-form";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { listOrganisations } from "@/lib/people/queries-organisations";
import { inviteAction } from "./actions";

export const metadata = { title: "Invite" };

export default async function InvitePage() {
  const user = await requireUser();
  if (!can(user.role, "user.invite")) notFound();
  const orgs = await listOrganisations(user);
  return (
    <>
      <PageHeader
        title="Invite a provider or an analyst"
        description="They get an e-mail with a link to choose their password (valid for 7 days). Admit their organisation to a study, or assign the analyst, on the study's page."
      />
      <InviteForm
        organisations={orgs.map((o) => ({ id: o.id, name: o.name, kind: o.kind }))}
        invite={inviteAction}
      />
    </>
  );
}
