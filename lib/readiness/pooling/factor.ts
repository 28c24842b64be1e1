/**
 * Triangular factors of [X | y] for the pool's questions. A factor A is (c+1)×(c+1), upper
 * triangular, row-major, last column y: AᵀA = [X | y]ᵀ[X | y], so ‖[X | y] w‖ = ‖A w‖ for any w
 * and A[c][c]² is the residual sum of squares. Columns are selected, reordered and dropped by
 * Givens rotations on the factor (Golub & Van Loan, Matrix Computations, §5.1.8 and §6.5);
 * rows are never read again and XᵀX is never formed.
 */
import { ALIAS_TOLERANCE } from "../stats/aliasing";
import { LeastSquares } from "../stats/least-squares";
import type { EngineState } from "../state";

export interface Factor {
  /** complete rows behind the factor */
  n: number;
  /** design column names, in the factor's order (y not included) */
  columns: string[];
  /** (columns.length + 1)² entries */
  a: Float64Array;
}

/**
 * The one adapter to the engine's state: the factor of a batch (or merged pool) state for the
 * given design columns; a column the state lacks (a level it never saw) is a column of zeros.
 */
export function factorOf(state: EngineState, columns: string[]): Factor {
  const ls = LeastSquares.fromJSON(state.ls);
  const same = ls.k === columns.length && state.design.columns.every((c, i) => c === columns[i]);
  const fit = same ? ls : ls.expandColumns(state.design.columns, columns);
  return { n: fit.n, columns: [...columns], a: fit.augmentedFactor() };
}

/**
 * Givens QR in place of a rows×cols block (row stride `stride`, last column y) whose columns
 * are taken in order. A predictor column whose part orthogonal to the columns kept before it
 * has length ≤ tol × its own length is aliased: it is deleted and the next column moves in.
 * With tol < 0 nothing is deleted. The result is the (d+1)×(d+1) upper-triangular factor in
 * the top-left corner (rows below it zero); returns the kept column positions (y excluded).
 */
export function givensTriangularise(
  m: Float64Array,
  rows: number,
  cols: number,
  stride: number,
  tol = -1,
): number[] {
  const kept: number[] = [];
  let width = cols;
  let q = 0;
  for (let orig = 0; orig < cols; orig++) {
    const isY = orig === cols - 1;
    let norm2 = 0;
    let resid2 = 0;
    if (tol >= 0 && !isY) {
      for (let i = 0; i < rows; i++) {
        const v = m[i * stride + q]!;
        norm2 += v * v;
        if (i >= q) resid2 += v * v;
      }
    }
    if (!isY && tol >= 0 && (norm2 === 0 || Math.sqrt(resid2) <= tol * Math.sqrt(norm2))) {
      // aliased: delete column q (shift the columns right of it one place left)
      for (let i = 0; i < rows; i++) {
        const r = i * stride;
        for (let l = q; l < width - 1; l++) m[r + l] = m[r + l + 1]!;
        m[r + width - 1] = 0;
      }
      width--;
      continue;
    }
    if (q >= rows) break;
    for (let i = q + 1; i < rows; i++) {
      const b = m[i * stride + q]!;
      if (b === 0) continue;
      const a = m[q * stride + q]!;
      const h = Math.sqrt(a * a + b * b);
      const c = a / h;
      const s = b / h;
      const rq = q * stride;
      const ri = i * stride;
      for (let l = q; l < width; l++) {
        const x = m[rq + l]!;
        const y = m[ri + l]!;
        m[rq + l] = c * x + s * y;
        m[ri + l] = c * y - s * x;
      }
      m[ri + q] = 0;
    }
    if (!isY) kept.push(orig);
    q++;
  }
  return kept;
}

/**
 * The factor of the given columns (indices into f.columns, any order) and y. With a tolerance,
 * aliased columns are left out (the ALIAS_TOLERANCE of the engine by default: "rank").
 */
export function selectColumns(f: Factor, idx: number[], tol: number | "rank" = -1): Factor {
  const K = f.columns.length + 1;
  const c = idx.length + 1;
  const m = new Float64Array(K * c);
  for (let i = 0; i < K; i++) {
    for (let j = 0; j < idx.length; j++) m[i * c + j] = f.a[i * K + idx[j]!]!;
    m[i * c + idx.length] = f.a[i * K + K - 1]!;
  }
  const kept = givensTriangularise(m, K, c, c, tol === "rank" ? ALIAS_TOLERANCE : tol);
  const d = kept.length + 1;
  const a = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    for (let j = i; j < kept.length; j++) a[i * d + j] = m[i * c + j]!;
    a[i * d + d - 1] = m[i * c + kept.length]!;
  }
  return { n: f.n, columns: kept.map((j) => f.columns[idx[j]!]!), a };
}

/** The factor of the union of two row sets with the same columns: stack and re-triangularise. */
export function mergeFactors(x: Factor, y: Factor): Factor {
  const K = x.columns.length + 1;
  if (y.columns.length + 1 !== K) throw new RangeError("mergeFactors: the factors have different columns");
  const m = new Float64Array(2 * K * K);
  m.set(x.a, 0);
  m.set(y.a, K * K);
  givensTriangularise(m, 2 * K, K, K);
  return { n: x.n + y.n, columns: x.columns, a: m.slice(0, K * K) };
}

/** Residual sum of squares of a factor (its last diagonal entry squared). */
export function rssOf(f: Factor): number {
  const K = f.columns.length + 1;
  const v = f.a[K * K - 1]!;
  return v * v;
}

export interface Fit {
  n: number;
  rank: number;
  rss: number;
  /** by column of the input factor; null for an aliased column */
  beta: (number | null)[];
  se: (number | null)[];
}

/** Coefficients of a full-rank factor: back-substitution R β = z. */
export function solveFactor(f: Factor): Float64Array {
  const d = f.columns.length;
  const K = d + 1;
  const b = new Float64Array(d);
  for (let i = d - 1; i >= 0; i--) {
    let s = f.a[i * K + d]!;
    for (let j = i + 1; j < d; j++) s -= f.a[i * K + j]! * b[j]!;
    b[i] = s / f.a[i * K + i]!;
  }
  return b;
}

/**
 * The least-squares fit of a factor, rank-aware: aliased columns (a level without rows, a
 * constant column, more columns than rows) get no coefficient and do not count in the rank.
 */
export function fitOf(f: Factor, withSe = true): Fit {
  const idx = f.columns.map((_, i) => i);
  const r = selectColumns(f, idx, "rank");
  const d = r.columns.length;
  const K = d + 1;
  const rss = rssOf(r);
  const b = solveFactor(r);
  const pos = new Map(r.columns.map((c, i) => [c, i]));
  const se = new Float64Array(d).fill(NaN);
  const df = f.n - d;
  if (withSe && df > 0) {
    // Var(β) = σ² R⁻¹R⁻ᵀ: column by column of R⁻¹ (upper triangular)
    const inv = new Float64Array(d * d);
    for (let j = 0; j < d; j++) {
      inv[j * d + j] = 1 / r.a[j * K + j]!;
      for (let i = j - 1; i >= 0; i--) {
        let s = 0;
        for (let l = i + 1; l <= j; l++) s += r.a[i * K + l]! * inv[l * d + j]!;
        inv[i * d + j] = -s / r.a[i * K + i]!;
      }
    }
    const sigma2 = rss / df;
    for (let i = 0; i < d; i++) {
      let s = 0;
      for (let j = i; j < d; j++) s += inv[i * d + j]! ** 2;
      se[i] = Math.sqrt(sigma2 * s);
    }
  }
  return {
    n: f.n,
    rank: d,
    rss,
    beta: f.columns.map((c) => (pos.has(c) ? b[pos.get(c)!]! : null)),
    se: f.columns.map((c) => (pos.has(c) && Number.isFinite(se[pos.get(c)!]!) ? se[pos.get(c)!]! : null)),
  };
}

/**
 * Prefix and suffix merges of a list of factors: rest(i) = all but factor i in O(g) merges.
 * Returns the factor of everything and a function for each rest (null when nothing is left).
 */
export function restsOf(parts: Factor[]): { all: Factor; rest: (i: number) => Factor | null } {
  const g = parts.length;
  const prefix: Factor[] = [];
  const suffix: (Factor | null)[] = new Array(g + 1).fill(null);
  parts.forEach((p, i) => prefix.push(i === 0 ? p : mergeFactors(prefix[i - 1]!, p)));
  for (let i = g - 1; i >= 0; i--)
    suffix[i] = suffix[i + 1] ? mergeFactors(parts[i]!, suffix[i + 1]!) : parts[i]!;
  return {
    all: prefix[g - 1]!,
    rest: (i) => {
      const before = i > 0 ? prefix[i - 1]! : null;
      const after = suffix[i + 1] ?? null;
      if (before && after) return mergeFactors(before, after);
      return before ?? after;
    },
  };
}
