/**
 * The pool page's three questions, read from the figures the worker stored: can the batches
 * be pooled, does anything predict, and which predictors. Nothing is computed per page view.
 */
import { Section } from "@/components/ui";
import { FindingsTable } from "@/components/report/report-tables";
import { formatCount, formatNumber } from "@/lib/format";
import type { QuestionsView } from "@/lib/pool/questions";
import type { PoolQuestions } from "@/lib/readiness";
import { CriteriaCharts } from "./criteria-chart";
import { InfluenceChart } from "./influence-chart";
import { PoolabilityTable, type PoolabilityRow } from "./poolability-table";
import { formatDf, formatP, formatStat, pIs } from "./questions-format";
import { QuestionsStatus } from "./questions-status";
import { ChosenSubsets, SelectionPaths } from "./selection-tables";
import { StabilityBars } from "./stability-bars";

const findings = (q: PoolQuestions, prefix: string) =>
  q.findings.filter((f) => f.code.startsWith(prefix)).map((f, i) => ({ ...f, id: `${prefix}${i}` }));

function Callout({ children, testId }: { children: React.ReactNode; testId?: string }) {
  return (
    <div
      className="mb-3 rounded border-l-4 border-channel bg-shallows px-4 py-2 text-sm"
      data-testid={testId}
    >
      {children}
    </div>
  );
}

function Poolability({ q, slug }: { q: PoolQuestions; slug: string }) {
  const p = q.poolability;
  const rows: PoolabilityRow[] = [
    ...p.batches.map((r) => ({ ...r, of: "batch" as const, key: `b-${r.id}` })),
    ...p.providers.map((r) => ({ ...r, of: "provider" as const, key: `p-${r.id}` })),
  ];
  const own = findings(q, "pool.");
  return (
    <div className="grid grid-cols-1 gap-4">
      {p.whole ? (
        <Callout testId="whole-pool-test">
          <p className="font-semibold">{p.whole.words}</p>
          <p className="tabular-nums">
            All {p.whole.groups} batches share one set of coefficients? F = {formatStat(p.whole.F)} on{" "}
            {formatDf(p.whole.df1, p.whole.df2)} df, {pIs(p.whole.p)}
            {p.whole.small
              ? ` (${p.whole.small} too small to fit alone enter as Chow's predictive test does)`
              : ""}
            .
          </p>
        </Callout>
      ) : null}
      <PoolabilityTable rows={rows} threshold={q.influence.threshold} csvName={`${slug}-poolability`} />
      <div>
        <h3 className="mb-1 text-md font-semibold">Influence of each batch</h3>
        <p className="mb-2 text-sm text-silt-ink">
          How far the pool&apos;s coefficients move when the batch is left out, in standard errors of the pool
          with it (a batch-level DFBETAS). A shift of {formatStat(q.influence.threshold)} standard error or
          more is marked (common practice).
        </p>
        <InfluenceChart
          rows={q.influence.batches}
          threshold={q.influence.threshold}
          csvName={`${slug}-influence`}
        />
      </div>
      {own.length ? (
        <FindingsTable
          findings={own}
          caption="Findings on poolability and influence"
          csvName={`${slug}-poolability-findings`}
        />
      ) : null}
    </div>
  );
}

function Overall({ q }: { q: PoolQuestions }) {
  const o = q.overall;
  if (!o)
    return <p className="text-sm text-silt-ink">No test: the pool has no residual degrees of freedom yet.</p>;
  return (
    <div className="grid grid-cols-1 gap-2">
      <Callout testId="overall-test">
        <p className="font-semibold">{o.words}</p>
      </Callout>
      <table className="w-full max-w-xl text-sm tabular-nums">
        <caption className="sr-only">The overall F test of the pool</caption>
        <tbody>
          {[
            ["F", `${formatStat(o.F)} on ${formatDf(o.df1, o.df2)} df`],
            ["p", formatP(o.p)],
            ["R² · adjusted R²", `${formatNumber(o.r2, "estimate")} · ${formatNumber(o.adjR2, "estimate")}`],
            [
              `Smallest R² detectable at this n (power ${formatNumber(o.power, "estimate")}, α = ${formatNumber(o.alpha, "estimate")})`,
              formatNumber(o.detectableR2, "estimate"),
            ],
          ].map(([k, v]) => (
            <tr key={k} className="border-b border-silt-line/50">
              <th scope="row" className="py-1 pr-4 text-left font-normal">
                {k}
              </th>
              <td className="py-1 text-right">{v}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function Selection({ q, slug }: { q: PoolQuestions; slug: string }) {
  const s = q.selection;
  if (!s) {
    return (
      <p className="text-sm text-silt-ink">
        The plan names no selection candidates. List the candidate terms by name under <em>selection</em> in
        the plan (and the terms forced in under <em>required</em>) to see which subsets the pool supports.
      </p>
    );
  }
  const own = findings(q, "selection.");
  return (
    <div className="grid grid-cols-1 gap-4">
      <Callout testId="selection-caution">
        <p className="font-semibold">{q.caution}</p>
      </Callout>
      <p className="text-sm">
        {s.candidates.length} candidate {s.candidates.length === 1 ? "term" : "terms"}
        {s.required.length ? `, always with ${s.required.join(", ")}` : ""}, on {formatCount(s.n)} complete
        rows. {s.exhaustive ? "Every subset searched (leaps and bounds on the pooled factor)." : s.why}
      </p>
      <CriteriaCharts selection={s} csvName={`${slug}-selection-by-size`} />
      <div>
        <h3 className="mb-1 text-md font-semibold">Chosen subsets</h3>
        <ChosenSubsets selection={s} csvName={`${slug}-selection-chosen`} />
      </div>
      <div>
        <h3 className="mb-1 text-md font-semibold">Stability</h3>
        {s.stability ? (
          <StabilityBars stability={s.stability} csvName={`${slug}-selection-stability`} />
        ) : (
          <p className="text-sm text-silt-ink">Stability needs at least three accepted batches.</p>
        )}
      </div>
      <div>
        <h3 className="mb-1 text-md font-semibold">Forward and backward paths</h3>
        <SelectionPaths selection={s} csvName={`${slug}-selection-paths`} />
      </div>
      {own.length ? (
        <FindingsTable
          findings={own}
          caption="Findings on the selection"
          csvName={`${slug}-selection-findings`}
        />
      ) : null}
    </div>
  );
}

export function PoolQuestionsSections({ view, slug }: { view: QuestionsView; slug: string }) {
  const q = view.stored?.result ?? null;
  const body = (part: (q: PoolQuestions) => React.ReactNode) =>
    q ? (
      part(q)
    ) : view.stored?.error ? (
      <p className="text-sm text-clay-ink">Could not be computed: {view.stored.error}</p>
    ) : view.stored ? (
      <p className="text-sm text-silt-ink">
        The pool has no accepted batches yet: accept a batch to ask its questions.
      </p>
    ) : null;
  return (
    <>
      <Section
        title="Can the batches be pooled?"
        id="poolability"
        note="Each batch and each provider against the rest of the pool by Chow's test (Chow 1960); beside p, the largest shift of the coefficients it causes — with thousands of rows a harmless difference tests significant, so read the size too."
      >
        <div className="grid grid-cols-1 gap-3">
          <QuestionsStatus view={view} what="the pool's questions" />
          {body((x) => (
            <Poolability q={x} slug={slug} />
          ))}
        </div>
      </Section>
      <Section
        title="Does anything predict?"
        id="overall"
        note="The overall F test of the pool's model: all slopes zero against the model as planned."
      >
        {body((x) => (
          <Overall q={x} />
        ))}
      </Section>
      <Section
        title="Which predictors?"
        id="selection"
        note="A preview over the plan's candidate terms: best subsets by size, the criteria, leave-one-batch-out cross-validation and stability."
      >
        {body((x) => (
          <Selection q={x} slug={slug} />
        ))}
      </Section>
    </>
  );
}
