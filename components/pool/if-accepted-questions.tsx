/**
 * "If accepted", the pool's questions: this version's Chow test against the pool and its
 * influence on the pool's coefficients, as the worker stored them when its check finished.
 */
import { FindingsTable } from "@/components/report/report-tables";
import type { SessionUser } from "@/lib/auth/session";
import { getIfAcceptedQuestionsForUser } from "@/lib/pool/questions-access";
import { InfluenceChart } from "./influence-chart";
import { PoolabilityTable } from "./poolability-table";
import { QuestionsStatus } from "./questions-status";

export async function IfAcceptedQuestions({
  user,
  batchPublicId,
  version,
}: {
  user: SessionUser;
  batchPublicId: string;
  version: number;
}) {
  const found = await getIfAcceptedQuestionsForUser(user, batchPublicId, version);
  if (!found) return null;
  const { view } = found;
  const q = view.stored?.result ?? null;
  const name = `${batchPublicId}-v${version}`;
  return (
    <div className="grid grid-cols-1 gap-3" data-testid="if-accepted-questions">
      <h3 className="text-md font-semibold">Can it be pooled?</h3>
      <QuestionsStatus view={view} what="this version's poolability and influence" />
      {view.stored?.error ? (
        <p className="text-sm text-clay-ink">Could not be computed: {view.stored.error}</p>
      ) : null}
      {q?.poolability.candidate ? (
        <PoolabilityTable
          rows={[{ ...q.poolability.candidate, of: "under review", key: "candidate" }]}
          threshold={q.influence.threshold}
          csvName={`${name}-poolability`}
        />
      ) : q ? (
        <p className="text-sm text-silt-ink">
          The pool is empty: there is nothing to test this version against yet.
        </p>
      ) : null}
      {q?.influence.candidate ? (
        <InfluenceChart
          rows={[
            q.influence.candidate,
            ...q.influence.batches.filter((b) => b.id !== q.influence.candidate?.id),
          ]}
          threshold={q.influence.threshold}
          caption="Influence of this version (in the pool with it) and of each accepted batch (in the pool as it stands)"
          csvName={`${name}-influence`}
        />
      ) : null}
      {q && q.findings.some((f) => f.code.startsWith("pool.")) ? (
        <FindingsTable
          findings={q.findings
            .filter((f) => f.code.startsWith("pool."))
            .map((f, i) => ({ ...f, id: `pq-${i}` }))}
          caption="Poolability warnings if accepted"
          csvName={`${name}-poolability-findings`}
        />
      ) : null}
    </div>
  );
}
