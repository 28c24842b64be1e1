import { getHomeSummary } from "@/lib/batches/queries-home";
import { PageHeader } from "@/components/ui/page-header";
import { Section } from "@/components/ui/section";
import { EmptyState } from "@/components/ui/empty-state";
import { StateLedger } from "@/components/state-ledger";
import { StudyTable } from "@/components/home/study-table";
import { BatchTable } from "@/components/home/batch-table";
import { requireRole, toBatchRows, toStudyRow } from "../home-helpers";

export const metadata = { title: "Home" };

export default async function ProviderHome() {
  const user = await requireRole("provider");
  const home = await getHomeSummary(user);
  if (home.role !== "provider") throw new Error("home summary for the wrong role");
  const orgName = home.organisation?.name ?? "No organisation";
  return (
    <>
      <PageHeader
        eyebrow="Data provider"
        title={orgName}
        description="The studies your organisation sends batches to, and where each of your batches stands."
      />
      <Section id="by-state" title="Your batches by state">
        <StateLedger counts={home.batchesByState} label={`Batches from ${orgName} by state`} />
      </Section>
      <Section
        id="studies"
        title="Studies you are admitted to"
        note="Each study has one data plan; your batches are checked against its current version."
      >
        {home.studies.length ? (
          <StudyTable
            variant="provider"
            caption="Studies you are admitted to"
            rows={home.studies.map(toStudyRow)}
          />
        ) : (
          <EmptyState title="Not admitted to any study yet">
            A study lead admits your organisation to a study; ask them if you expected to see one here.
          </EmptyState>
        )}
      </Section>
      <Section
        id="recent"
        title="Recent batches"
        note="The ten most recent, newest first, with the state of their latest version."
      >
        <BatchTable
          caption="Recent batches"
          rows={toBatchRows(home.recentBatches)}
          emptyTitle="No batches yet"
          emptyText="When your organisation uploads a file for a study, it appears here with its readiness state."
        />
      </Section>
    </>
  );
}
