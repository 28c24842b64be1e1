import Link from "next/link";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/auth/permissions";
import { requireUser } from "@/lib/auth/session";
import { listStudyRowsForUser } from "@/lib/studies/queries";
import { StudiesTable } from "./studies-table";

export const metadata = { title: "Studies" };

const SCOPE: Record<string, string> = {
  provider: "The studies your organisation is admitted to.",
  analyst: "The studies you are assigned to.",
  lead: "Every study, with its data plan and who takes part.",
  admin: "Every study, with its data plan and who takes part.",
};

export default async function StudiesPage() {
  const user = await requireUser();
  const rows = await listStudyRowsForUser(user);
  const manage = can(user.role, "study.manage");
  const newButton = manage ? (
    <Link
      href="/studies/new"
      className="inline-flex h-9 items-center rounded border border-channel bg-channel px-3.5 font-semibold text-white hover:bg-channel-deep hover:text-white"
    >
      New study
    </Link>
  ) : null;
  return (
    <>
      <PageHeader title="Studies" description={SCOPE[user.role]} actions={newButton} />
      {rows.length === 0 ? (
        <EmptyState title="No studies yet" action={newButton}>
          {manage
            ? "Create a study, publish its data plan, then admit the provider organisations that send batches."
            : user.role === "provider"
              ? "Your organisation is not admitted to any study yet. The study's lead admits it."
              : "You are not assigned to any study yet. A lead or admin assigns analysts to studies."}
        </EmptyState>
      ) : (
        <StudiesTable
          showAnalysts={user.role !== "provider"}
          rows={rows.map((s) => ({
            id: s.id,
            slug: s.slug,
            title: s.title,
            team: s.teamOrganisationName,
            status: s.status,
            planVersion: s.currentPlanVersion,
            providers: s.providers,
            analysts: s.analysts,
          }))}
        />
      )}
    </>
  );
}
