import Link from "next/link";
import { getHomeSummary } from "@/lib/batches/queries-home";
import { getStudyForUser } from "@/lib/studies/queries-detail";
import { PageHeader } from "@/components/ui/page-header";
import { Section } from "@/components/ui/section";
import { EmptyState } from "@/components/ui/empty-state";
import { StateLedger } from "@/components/state-ledger";
import { StudyTable } from "@/components/home/study-table";
import { requireRole, toStudyRow } from "../home-helpers";

export const metadata = { title: "Home" };

export default async function LeadHome() {
  const user = await requireRole("lead");
  const home = await getHomeSummary(user);
  if (home.role !== "lead") throw new Error("home summary for the wrong role");
  // provider names per study (a handful of studies: one small query each)
  const details = await Promise.all(home.studies.map((s) => getStudyForUser(user, s.id)));
  const providersOf = new Map(
    details.filter((d) => d !== null).map((d) => [d.id, d.providers.map((p) => p.name)]),
  );
  return (
    <>
      <PageHeader
        eyebrow="Lead"
        title="Intake across studies"
        description="Where every batch stands, and which providers send data to each study."
        actions={
          <>
            <Link
              href="/board"
              className="rounded border border-channel bg-channel px-3 py-1.5 text-sm font-semibold text-white hover:bg-channel-deep"
            >
              Status board
            </Link>
            <Link
              href="/pool"
              className="rounded border border-silt bg-white px-3 py-1.5 text-sm font-semibold text-ink hover:bg-sand-deep"
            >
              Pools
            </Link>
          </>
        }
      />
      <Section id="by-state" title="All batches by state">
        <StateLedger counts={home.batchesByState} label="All batches by state" />
      </Section>
      <Section id="studies" title="Studies">
        {home.studies.length ? (
          <StudyTable
            variant="lead"
            caption="Studies"
            rows={home.studies.map((s) => ({
              ...toStudyRow(s),
              providersAdmitted: s.providersAdmitted,
              providers: providersOf.get(s.id) ?? [],
            }))}
          />
        ) : (
          <EmptyState title="No studies yet">
            An administrator creates studies and their data plans.
          </EmptyState>
        )}
      </Section>
    </>
  );
}
