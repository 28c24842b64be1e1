/**
 * The selection preview: which subsets of the plan's candidate terms the pool supports, by
 * which criterion, and whether the choice survives leaving one batch out. Exhaustive (leaps
 * and bounds) up to EXHAUSTIVE_LIMIT candidate terms; above it the forward and backward paths.
 */
import type { PoolContext } from "./context";
import { crossValidate, type SizeModels } from "./lobo";
import { greedyPath, pathSubsets } from "./paths";
import { criteriaOf, problemOf, rssOfSubset, type Problem } from "./problem";
import { bestSubsets } from "./subsets";
import { selectionTerms } from "./terms";
import type { ModelCriteria, SelectionPreview } from "./types";

/** up to this many candidate terms the best subset of every size is found exactly */
export const EXHAUSTIVE_LIMIT = 25;

function argBest(values: number[], better: (a: number, b: number) => boolean): number {
  let best = -1;
  values.forEach((v, i) => {
    if (Number.isFinite(v) && (best < 0 || better(v, values[best]!))) best = i;
  });
  return best;
}

/** Best model of every size: exact up to the limit, else the forward AIC path's models. */
function modelsBySize(pr: Problem, seeds: number[][]): { subset: number[]; rss: number }[] {
  if (pr.terms.length <= EXHAUSTIVE_LIMIT) return bestSubsets(pr, seeds);
  return pathSubsets(pr, greedyPath(pr, "forward", "aic")).map((subset) => ({
    subset,
    rss: rssOfSubset(pr, subset),
  }));
}

/** A fold's models by size, the pool's best subsets (by term name) as the first incumbents. */
function sizeModelsFrom(poolBest: string[][]): (pr: Problem) => SizeModels {
  return (pr) => {
    const index = new Map(pr.terms.map((t, i) => [t.name, i]));
    const seeds = poolBest
      .filter((s) => s.every((t) => index.has(t)))
      .map((s) => s.map((t) => index.get(t)!));
    const best = modelsBySize(pr, seeds);
    const bic = best.map((b) => criteriaOf(pr, b.subset, b.rss).bic);
    return {
      bySize: best.map((b) => b.subset),
      bicSize: Math.max(
        0,
        argBest(bic, (a, b) => a < b),
      ),
    };
  };
}

export function selectionPreview(ctx: PoolContext): SelectionPreview | null {
  const st = selectionTerms(ctx.plan, ctx.design.terms);
  if (!st) return null;
  const intercept = ctx.plan.intercept;
  const forcedColumns = [...(intercept ? ["intercept"] : []), ...st.forced.flatMap((t) => t.columns)];
  const candidates = st.candidates.map((t) => ({ term: t.term, columns: t.columns }));
  const pr = problemOf(ctx.all, forcedColumns, candidates, intercept);
  const m = pr.terms.length;
  const exhaustive = m <= EXHAUSTIVE_LIMIT;
  const forward = { aic: greedyPath(pr, "forward", "aic"), bic: greedyPath(pr, "forward", "bic") };
  const backward = { aic: greedyPath(pr, "backward", "aic"), bic: greedyPath(pr, "backward", "bic") };
  const seeds = exhaustive
    ? [forward.aic, forward.bic, backward.aic, backward.bic].flatMap((p) => pathSubsets(pr, p))
    : [];
  const bySize: (ModelCriteria & { size: number })[] = modelsBySize(pr, seeds).map((b, size) => ({
    size,
    ...criteriaOf(pr, b.subset, b.rss),
  }));

  const picks: SelectionPreview["picks"] = [];
  const pick = (criterion: SelectionPreview["picks"][number]["criterion"], i: number) => {
    if (i >= 0) picks.push({ criterion, size: bySize[i]!.size, terms: bySize[i]!.terms });
  };
  pick(
    "adjR2",
    argBest(
      bySize.map((b) => b.adjR2),
      (a, b) => a > b,
    ),
  );
  pick(
    "cp",
    argBest(
      bySize.map((b) => b.cp),
      (a, b) => a < b,
    ),
  );
  pick(
    "aic",
    argBest(
      bySize.map((b) => b.aic),
      (a, b) => a < b,
    ),
  );
  pick(
    "bic",
    argBest(
      bySize.map((b) => b.bic),
      (a, b) => a < b,
    ),
  );

  let lobo: SelectionPreview["lobo"] = null;
  let stability: SelectionPreview["stability"] = null;
  const folds = ctx.batches.flatMap((b) =>
    b.rest && b.factor.n > 0 ? [{ own: b.factor, rest: b.rest }] : [],
  );
  if (folds.length >= 3) {
    const cv = crossValidate(
      folds,
      forcedColumns,
      candidates.filter((c) => !pr.unestimable.includes(c.term)),
      intercept,
      sizeModelsFrom(bySize.map((b) => b.terms)),
    );
    lobo = cv.lobo;
    stability = cv.stability;
    if (lobo.size !== null && bySize[lobo.size]) pick("lobo", lobo.size);
  }
  return {
    candidates: pr.terms.map((t) => t.name),
    required: st.required,
    ...(pr.unestimable.length ? { unestimable: pr.unestimable } : {}),
    n: pr.n,
    sigma2: pr.sigma2,
    bySize,
    exhaustive,
    why: exhaustive
      ? null
      : `With ${m} candidate terms there are 2^${m} ≈ ${Math.pow(2, m).toExponential(1)} subsets: an exhaustive search is out of reach, so only the forward and backward paths are shown (the best subset of a size may lie off both paths).`,
    forward,
    backward,
    picks,
    lobo,
    stability,
  };
}
