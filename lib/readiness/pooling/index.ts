/**
 * The pool's own questions: can these batches be pooled, does anything predict, and which
 * model can the pool carry? All from the stored engine states. See README.md in this folder.
 */
import type { Plan } from "../plan";
import { buildContext, termsOfColumns, tssOf } from "./context";
import { fitOf } from "./factor";
import { poolFindings } from "./findings";
import { INFLUENCE_THRESHOLD, influenceRow, largestOf, shiftsOf, type Frame } from "./influence";
import { chowRow, overallTest, unitFits, wholePool } from "./poolability";
import { selectionPreview } from "./selection";
import {
  POOL_QUESTIONS_FORMAT,
  type InfluenceRow,
  type PoolMember,
  type PoolQuestions,
  type PoolQuestionsOptions,
} from "./types";

export * from "./types";
export { selectionTerms, selectionBudget, type SelectionTerms } from "./terms";
export { factorOf, type Factor } from "./factor";

export const POOL_CAUTION =
  "Selection on the same data overstates the fit: the chosen model's R² and p-values are optimistic. The preview plans the analysis; it does not replace it. These figures support the analyst's judgement; they do not replace it.";

/**
 * Poolability, batch influence, the overall F test and the selection preview of a pool of
 * accepted batch versions (and of a version under review, `opts.candidate`, "if accepted").
 * Throws a RangeError with a plain message when the pool is empty or a state is not valid.
 */
export function poolQuestions(
  members: PoolMember[],
  plan: Plan,
  opts: PoolQuestionsOptions = {},
): PoolQuestions {
  const ctx = buildContext(members, plan, opts.candidate);
  const { t, fitAll } = ctx;
  const dfTarget = t.dfTarget ?? t.dfFloor;
  const fr: Frame = { columns: ctx.columns, termOf: ctx.termOf, intercept: plan.intercept, dfTarget };
  const k = fitAll.rank;

  const batchFits = ctx.batches.map((b) => unitFits(b.factor, b.rest));
  const influence: InfluenceRow[] = [];
  const batches = ctx.batches.flatMap((b, i) => {
    const f = batchFits[i]!;
    if (!f.rest || !b.rest) return [];
    const row = influenceRow(b.id, b.label, b.factor.n, ctx.all, fitAll, b.rest, f.rest, fr);
    influence.push(row);
    return [chowRow(b.id, b.label, f.own, f.rest, fitAll, k, row.largest, t.alpha)];
  });
  const providers = ctx.providers.flatMap((g) => {
    const f = unitFits(g.factor, g.rest);
    if (!f.rest) return [];
    return [
      chowRow(
        g.id,
        g.label,
        f.own,
        f.rest,
        fitAll,
        k,
        largestOf(shiftsOf(fitAll, f.rest, fr)),
        t.alpha,
        "the other providers' batches",
      ),
    ];
  });

  let candidate: PoolQuestions["poolability"]["candidate"] = null;
  let candidateInfluence: InfluenceRow | null = null;
  if (ctx.candidate) {
    const c = ctx.candidate;
    const cfr: Frame = { ...fr, columns: c.design.columns, termOf: termsOfColumns(c.design) };
    const withFit = fitOf(c.all);
    const f = unitFits(c.unit.factor, c.unit.rest);
    candidateInfluence = influenceRow(
      c.unit.id,
      c.unit.label,
      c.unit.factor.n,
      c.all,
      withFit,
      c.unit.rest!,
      f.rest!,
      cfr,
    );
    candidate = chowRow(
      c.unit.id,
      c.unit.label,
      f.own,
      f.rest!,
      withFit,
      withFit.rank,
      candidateInfluence.largest,
      t.alpha,
      "the accepted pool",
    );
  }

  const partial: Omit<PoolQuestions, "findings"> = {
    format: POOL_QUESTIONS_FORMAT,
    n: fitAll.n,
    parameters: k,
    columns: ctx.columns,
    terms: ctx.design.terms.map((tm) => tm.term),
    overall: overallTest(fitAll, tssOf(ctx.all, plan.intercept), plan.intercept, t.alpha, t.power),
    poolability: {
      whole: wholePool(
        batchFits.map((f) => f.own),
        fitAll,
        k,
        t.alpha,
      ),
      batches,
      providers,
      candidate,
    },
    influence: { threshold: INFLUENCE_THRESHOLD, batches: influence, candidate: candidateInfluence },
    selection: opts.selection === false ? null : selectionPreview(ctx),
    caution: POOL_CAUTION,
  };
  return { ...partial, findings: poolFindings(partial, t.alpha) };
}
