/**
 * Forward selection and backward elimination over the candidate terms, as R's step() does
 * them (Venables & Ripley 2002, §6.8): at each step the term whose addition (removal) gives the
 * smallest criterion n·log(RSS/n) + k·edf, k = 2 (AIC) or log(n) (BIC). step() stops at the
 * first step that does not lower the criterion by more than 1e-7; the path here goes on to the
 * end (all terms in, or none) and marks where step() would stop.
 */
import { givensTriangularise, selectColumns, type Factor } from "./factor";
import { criteriaOf, edfOf, penaltyOf, rssOfSubset, type Problem } from "./problem";
import type { PathStep, SelectionPath } from "./types";

/**
 * Forward steps without refits: the factor is kept in the column order [forced][chosen][others],
 * so the RSS with one more term t is that of y on t's columns within the rows below the chosen
 * block — a QR of (rows × (width + 1)) — and adding t moves its block up (one re-triangularisation).
 */
class ForwardFactor {
  private f: Factor;
  private layout: number[];
  private chosen = 0;
  constructor(private pr: Problem) {
    this.f = pr.f;
    this.layout = pr.terms.map((_, i) => i);
  }
  private offset(pos: number): number {
    let o = this.pr.forced;
    for (let i = 0; i < pos; i++) o += this.pr.terms[this.layout[i]!]!.width;
    return o;
  }
  rssWith(t: number): number {
    const K = this.f.columns.length + 1;
    const s0 = this.offset(this.chosen);
    const o = this.offset(this.layout.indexOf(t));
    const w = this.pr.terms[t]!.width;
    const rows = K - s0;
    const m = new Float64Array(rows * (w + 1));
    for (let i = 0; i < rows; i++) {
      for (let j = 0; j < w; j++) m[i * (w + 1) + j] = this.f.a[(s0 + i) * K + o + j]!;
      m[i * (w + 1) + w] = this.f.a[(s0 + i) * K + K - 1]!;
    }
    givensTriangularise(m, rows, w + 1, w + 1);
    return m[w * (w + 1) + w]! ** 2;
  }
  add(t: number): void {
    const pos = this.layout.indexOf(t);
    const from = this.offset(pos);
    const w = this.pr.terms[t]!.width;
    const s0 = this.offset(this.chosen);
    const cols = this.f.columns.map((_, i) => i);
    const moved = [
      ...cols.slice(0, s0),
      ...cols.slice(from, from + w),
      ...cols.slice(s0, from),
      ...cols.slice(from + w),
    ];
    this.f = selectColumns(this.f, moved);
    this.layout.splice(pos, 1);
    this.layout.splice(this.chosen, 0, t);
    this.chosen++;
  }
}

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
  const fwd = direction === "forward" ? new ForwardFactor(pr) : null;
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
      const r = fwd ? fwd.rssWith(t) : rssOfSubset(pr, s);
      const v = crit(pr, s, r, k);
      if (v < bestValue) {
        bestValue = v;
        bestSubset = s;
        bestRss = r;
        bestTerm = t;
      }
    }
    if (stop < 0 && bestValue >= value - 1e-7) stop = steps.length - 1;
    fwd?.add(bestTerm);
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
