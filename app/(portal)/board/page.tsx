import { LocalTime } from "@/components/ui/local-time";
import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader, Section, EmptyState } from "@/components/ui";
import { StateLedger } from "@/components/state-ledger";
import { BoardBatchesTable } from "@/components/board/batches-table";
import { DigestButton } from "@/components/board/digest-button";
import { formatHours } from "@/components/board/format";
import { HeadroomChart } from "@/components/board/headroom-chart";
import { IntakeFlow } from "@/components/board/intake-flow";
import { PoolHeadroom } from "@/components/board/pool-headroom";
import { ProviderChart } from "@/components/board/provider-chart";
import { TurnaroundChart } from "@/components/board/turnaround-chart";
import { BATCH_STATES, type BatchState } from "@/db/schema";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { formatDate } from "@/lib/format";
import { loadBoard } from "@/lib/pool";

export const metadata = { title: "Status board" };
export const dynamic = "force-dynamic";

const WEEKS = 12;

export default async function BoardPage() {
  const user = await requireUser();
  if (!can(user.role, "board.read")) notFound();
  const board = await loadBoard(WEEKS);

  const studies = [...new Map(board.pools.map((p) => [p.studySlug, p.studyTitle]))];
  const countsOf = (slug: string) => {
    const counts = Object.fromEntries(BATCH_STATES.map((s) => [s, 0])) as Record<BatchState, number>;
    for (const b of board.batches) if (b.studySlug === slug) counts[b.state]++;
    return counts;
  };
  const t = board.turnaround.overall;

  return (
    <>
      <PageHeader
        eyebrow="Lead"
        title="Status board"
        description="Where every batch stands and for how long, how fast batches are decided, which providers bounce, and whether each study's pool can carry its model."
        actions={<DigestButton />}
      />

      <Section
        title="Pools against their targets"
        id="pools"
        note="Residual df of each study's accepted data against the df target of its plan. Open a study for its pool."
      >
        <PoolHeadroom rows={board.pools} />
      </Section>

      <Section
        title="Headroom by week"
        id="headroom"
        note={`Each pool's residual df at the end of each of the last ${WEEKS} weeks, under the current plan, against its df target (dashed).`}
      >
        <HeadroomChart
          series={board.pools
            .filter((p) => !p.error)
            .map((p) => ({
              studySlug: p.studySlug,
              studyTitle: p.studyTitle,
              dfTarget: p.dfTarget,
              history: p.history,
            }))}
        />
      </Section>

      <Section
        title="Batches by state"
        id="by-state"
        note="The newest version of every batch. Time in state counts from the last change of state."
      >
        <div className="mb-4 grid grid-cols-1 gap-3">
          {studies.map(([slug, title]) => (
            <div key={slug}>
              <h3 className="mb-1 text-sm font-semibold">
                <Link href={`/pool/${slug}`} className="text-ink">
                  {title}
                </Link>
              </h3>
              <StateLedger counts={countsOf(slug)} label={`${title}: batches by state`} />
            </div>
          ))}
        </div>
        <BoardBatchesTable
          rows={board.batches.map((b) => ({
            id: `${b.batchPublicId}`,
            studyTitle: b.studyTitle,
            organisationName: b.organisationName,
            batchPublicId: b.batchPublicId,
            title: b.title,
            version: b.version,
            state: b.state,
            uploadedAt: b.uploadedAt.toISOString(),
            stateChangedAt: b.stateChangedAt.toISOString(),
            hoursInState: b.hoursInState,
          }))}
        />
      </Section>

      <Section
        title="Intake flow"
        id="flow"
        note={`Versions uploaded in the last ${WEEKS} weeks and where they went.`}
      >
        <IntakeFlow
          flow={board.flow}
          received={board.flowReceived}
          sinceLabel={formatDate(board.flowSince)}
        />
      </Section>

      <Section
        title="Turnaround"
        id="turnaround"
        note={`From a version's upload to its decision, by week of the decision (UTC). Over ${WEEKS} weeks: ${t.decisions} decisions, median ${formatHours(t.medianHours)}, 90th percentile ${formatHours(t.p90Hours)}.`}
      >
        <TurnaroundChart weeks={board.turnaround.weeks} />
      </Section>

      <Section
        title="Providers"
        id="providers"
        note="Bounce rate is bounces over decisions; versions per batch counts resubmissions."
      >
        <ProviderChart
          rows={board.providers.map((p) => ({ ...p, id: `${p.studySlug}:${p.organisationName}` }))}
        />
      </Section>

      <Section title="Admitted providers with nothing sent" id="silent">
        {board.silent.length === 0 ? (
          <EmptyState title="Every admitted provider has sent at least one batch." />
        ) : (
          <ul className="grid grid-cols-1 gap-1 text-sm" data-testid="silent-providers">
            {board.silent.map((s) => (
              <li key={`${s.studySlug}:${s.organisationName}`}>
                <span className="font-semibold">{s.organisationName}</span> — {s.studyTitle}, admitted{" "}
                <LocalTime value={s.admittedAt} dateOnly />
              </li>
            ))}
          </ul>
        )}
      </Section>
    </>
  );
}
