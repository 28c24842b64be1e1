/**
 * Forward selection and backward elimination over the candidate terms, as R's step() does
 * them (Venables & Ripley 2002, §6.8): at each step the term whose addition (removal) gives the
 * smallest criterion n·log(RSS/n) + k·edf, k = 2 (AIC) or log(n) (BIC). step() stops at the
 * first step that does not lower the criterion by more than 1e-7; the path here goes on to the
 * end (all terms in, or none) and marks where step() would stop.
 */
import { criteriaOf, edfOf, penaltyOf, rssOfSubset, type Problem } from "./problem";
import type { PathStep, SelectionPath } from "./types";

function crit(pr: Problem, subset: number[], rss: number, k: number): number {
  return pr.n * Math.log(rss / pr.n) + k * edfOf(pr, subset);
}

export function greedyPath(
  pr: Problem,
  direction: "forward" | "backward",
  criterion: "aic" | "bic",
): SelectionPath {
  const k = penaltyOf(criterion, pr.n);
  const m = pr.terms.length;
  let current = direction === "forward" ? [] : pr.terms.map((_, i) => i);
  let rss = rssOfSubset(pr, current);
  const steps: PathStep[] = [{ ...criteriaOf(pr, current, rss), change: null }];
  let stop = -1;
  let value = crit(pr, current, rss, k);
  for (let step = 0; step < m; step++) {
    let bestValue = Infinity;
    let bestSubset: number[] = [];
    let bestRss = NaN;
    let bestTerm = -1;
    const options =
      direction === "forward" ? pr.terms.map((_, i) => i).filter((t) => !current.includes(t)) : current;
    for (const t of options) {
      const s = direction === "forward" ? [...current, t] : current.filter((x) => x !== t);
      const r = rssOfSubset(pr, s);
      const v = crit(pr, s, r, k);
      if (v < bestValue) {
        bestValue = v;
        bestSubset = s;
        bestRss = r;
        bestTerm = t;
      }
    }
    if (stop < 0 && bestValue >= value - 1e-7) stop = steps.length - 1;
    current = bestSubset;
    rss = bestRss;
    value = bestValue;
    steps.push({ ...criteriaOf(pr, current, rss), change: pr.terms[bestTerm]!.name });
  }
  return { criterion, steps, stop: stop < 0 ? steps.length - 1 : stop };
}

/** Subsets (term indices) along a path, for seeding the exhaustive search. */
export function pathSubsets(pr: Problem, path: SelectionPath): number[][] {
  const index = new Map(pr.terms.map((t, i) => [t.name, i]));
  return path.steps.map((s) => s.terms.map((t) => index.get(t)!));
}
