import { redirect } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/auth/permissions";
import { requireUser } from "@/lib/auth/session";
import { listTeamOrganisations } from "@/lib/studies/queries";
import { NewStudyForm } from "./new-study-form";

export const metadata = { title: "New study" };

export default async function NewStudyPage() {
  const user = await requireUser();
  if (!can(user.role, "study.manage")) redirect("/studies");
  const teams = await listTeamOrganisations(user);
  return (
    <>
      <PageHeader
        eyebrow="Studies"
        title="New study"
        description="A study is one modelling effort. After creating it you publish its data plan, then admit provider organisations and assign analysts."
      />
      <NewStudyForm teams={teams} defaultTeamId={user.organisationId} />
    </>
  );
}
