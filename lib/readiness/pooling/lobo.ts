/**
 * Leave-one-batch-out cross-validation from states. For each accepted batch b the selection is
 * run on the other batches (their merged factor); the best model of each size is fitted there,
 * and b's prediction error is computed from b's own factor A_b alone:
 *   SSE_b = ‖X_b β − y_b‖² = ‖[X_b | y_b] w‖² = ‖A_b w‖²,  w = [β; −1] (0 for columns not in the model),
 * since A_bᵀA_b = [X_b | y_b]ᵀ[X_b | y_b]. The mean squared prediction error of a size is
 * Σ_b SSE_b / Σ_b n_b. Stability: the share of these fits whose BIC-chosen model contains each
 * candidate (the bootstrap idea of Sauerbrei & Schumacher 1992, Statistics in Medicine 11,
 * 2093–2109, with batches left out instead of resampled rows).
 */
import type { Factor } from "./factor";
import { coefficientsOf, problemOf, type Problem } from "./problem";
import type { SelectionPreview } from "./types";

export interface Fold {
  /** the batch left out, with its factor in the pool's columns */
  own: Factor;
  /** the other batches merged, same columns */
  rest: Factor;
}

export interface SizeModels {
  /** per size 0…m: term indices into the fold problem's terms, or null when the size is missing */
  bySize: (number[] | null)[];
  /** the BIC-chosen size */
  bicSize: number;
}

/** ‖A w‖² for w = [β; −1] laid out on the factor's columns. */
export function predictionSse(own: Factor, beta: Map<string, number>): number {
  const K = own.columns.length + 1;
  const w = new Float64Array(K);
  own.columns.forEach((c, j) => (w[j] = beta.get(c) ?? 0));
  w[K - 1] = -1;
  let s = 0;
  for (let i = 0; i < K; i++) {
    let v = 0;
    for (let j = i; j < K; j++) v += own.a[i * K + j]! * w[j]!;
    s += v * v;
  }
  return s;
}

export function crossValidate(
  folds: Fold[],
  forcedColumns: string[],
  candidates: { term: string; columns: string[] }[],
  intercept: boolean,
  select: (pr: Problem) => SizeModels,
): { lobo: NonNullable<SelectionPreview["lobo"]>; stability: NonNullable<SelectionPreview["stability"]> } {
  const m = candidates.length;
  const sse = new Array<number>(m + 1).fill(0);
  const missing = new Array<boolean>(m + 1).fill(false);
  const chosen = new Map(candidates.map((c) => [c.term, 0]));
  let rows = 0;
  for (const fold of folds) {
    const pr = problemOf(fold.rest, forcedColumns, candidates, intercept);
    const models = select(pr);
    rows += fold.own.n;
    for (let size = 0; size <= m; size++) {
      // a fold with unestimable terms has fewer sizes: its largest model stands in for the rest
      const s = models.bySize[Math.min(size, models.bySize.length - 1)];
      if (!s) {
        missing[size] = true;
        continue;
      }
      sse[size] = sse[size]! + predictionSse(fold.own, coefficientsOf(pr, s));
    }
    for (const t of models.bySize[models.bicSize] ?? []) {
      const name = pr.terms[t]!.name;
      chosen.set(name, chosen.get(name)! + 1);
    }
  }
  const mspe = sse.map((s, i) => (missing[i] || rows === 0 ? null : s / rows));
  let size: number | null = null;
  mspe.forEach((v, i) => {
    if (v !== null && (size === null || v < mspe[size]!)) size = i;
  });
  return {
    lobo: { folds: folds.length, mspe, size },
    stability: {
      criterion: "bic",
      folds: folds.length,
      shares: candidates.map((c) => ({ term: c.term, share: chosen.get(c.term)! / folds.length })),
    },
  };
}
