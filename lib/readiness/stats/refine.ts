/**
 * One step of iterative refinement of the least-squares coefficients (Björck 1967, "Iterative
 * refinement of linear least squares solutions I", BIT 7, 257–278; Higham, "Accuracy and
 * Stability of Numerical Algorithms", 2nd ed., §20.5): the residual e = y − Xb and the
 * gradient Xᵀe are computed in about twice the working precision (Dot2 of Ogita, Rump & Oishi
 * 2005, "Accurate sum and dot product", SIAM J. Sci. Comput. 26, 1955–1988), and the correction
 * comes from the stored factor: RᵀR·δ = Xᵀe (the corrected semi-normal equations).
 *
 * Refining against the factor alone cannot help: the rounding that matters is in the factor
 * itself (on the degree-5 polynomial of NIST's Wampler1 the exact solution of the computed
 * factor has 9.2 correct digits). So a LeastSquares state keeps a copy of its rows while they
 * are few (KEEP_MAX_VALUES numbers, the response included) — the small, possibly
 * ill-conditioned designs where the digits are lost; a large batch keeps none and is solved
 * from the factor as before. The step is kept only when it lowers the residual sum of squares
 * computed in the same extended care.
 */
import { solveUpper } from "./linalg";

/** Rows are kept while rows × (design columns + 1) stays within this (about 32 KB). */
export const KEEP_MAX_VALUES = 4096;

/** Veltkamp's splitting constant 2^27 + 1 for binary64. */
const SPLIT = 134217729;

/**
 * Σ a[i]·b[i] + init as accurate as if computed in twice the precision: Knuth's TwoSum and
 * Dekker's TwoProduct (JavaScript has no fused multiply-add), the error terms summed apart.
 */
export function dot2(a: ArrayLike<number>, b: ArrayLike<number>, init = 0): number {
  let s = init;
  let c = 0;
  for (let i = 0; i < a.length; i++) {
    const x = a[i] as number;
    const y = b[i] as number;
    const p = x * y;
    let t = SPLIT * x;
    const xh = t - (t - x);
    const xl = x - xh;
    t = SPLIT * y;
    const yh = t - (t - y);
    const yl = y - yh;
    const pe = xl * yl - (p - xh * yh - xl * yh - xh * yl);
    const sum = s + p;
    const bb = sum - s;
    c += pe + (s - (sum - bb) + (p - bb));
    s = sum;
  }
  return s + c;
}

/** The kept rows with one more appended ([x…, y] each), or null once they would exceed the bound. */
export function keepRow(kept: number[] | null, x: ArrayLike<number>, y: number): number[] | null {
  if (kept === null || kept.length + x.length + 1 > KEEP_MAX_VALUES) return null;
  for (let i = 0; i < x.length; i++) kept.push(x[i] as number);
  kept.push(y);
  return kept;
}

/** The rows of two states stacked, or null when either has none kept or together they exceed the bound. */
export function joinKept(a: number[] | null, b: number[] | null): number[] | null {
  if (a === null || b === null || a.length + b.length > KEEP_MAX_VALUES) return null;
  return a.concat(b);
}

/** Kept rows of k columns renamed to `width` columns: column j goes to targets[j] (dropped when −1). */
export function remapKept(
  kept: number[] | null,
  k: number,
  targets: number[],
  width: number,
): number[] | null {
  if (kept === null) return null;
  const out: number[] = [];
  for (let at = 0; at < kept.length; at += k + 1) {
    const row = new Array<number>(width + 1).fill(0);
    for (let j = 0; j < k; j++)
      if ((targets[j] as number) >= 0) row[targets[j] as number] = kept[at + j] as number;
    row[width] = kept[at + k] as number;
    out.push(...row);
  }
  return out;
}

/** Design values of the columns `cols` and the response of each kept row. */
function rowsOf(kept: readonly number[], k: number, cols: number[]): { x: number[][]; y: number[] } {
  const x: number[][] = [];
  const y: number[] = [];
  for (let at = 0; at < kept.length; at += k + 1) {
    x.push(cols.map((j) => kept[at + j] as number));
    y.push(kept[at + k] as number);
  }
  return { x, y };
}

function residuals(x: number[][], y: number[], b: number[]): number[] {
  const minus = b.map((v) => -v);
  return x.map((row, i) => dot2(row, minus, y[i] as number));
}

/**
 * b refined once against the kept rows: `cols` are the design columns b belongs to (the
 * non-aliased ones, in order) and `r` their upper-triangular factor (RᵀR = XᵀX over those
 * columns). Returns b unchanged when no rows are kept or the step does not lower the RSS.
 */
export function refineCoefficients(
  kept: readonly number[] | null,
  k: number,
  cols: number[],
  r: number[][],
  b: number[],
): number[] {
  const m = cols.length;
  if (kept === null || kept.length === 0 || m === 0) return b;
  const { x, y } = rowsOf(kept, k, cols);
  const e = residuals(x, y, b);
  // Rᵀu = Xᵀe (forward substitution), then R·δ = u (back substitution)
  const u = new Array<number>(m).fill(0);
  for (let p = 0; p < m; p++) {
    const g = dot2(
      x.map((row) => row[p] as number),
      e,
    );
    let s = g;
    for (let q = 0; q < p; q++) s -= ((r[q] as number[])[p] as number) * (u[q] as number);
    u[p] = s / ((r[p] as number[])[p] as number);
  }
  const delta = solveUpper(r, u, m);
  const refined = b.map((v, i) => v + (delta[i] as number));
  if (!refined.every(Number.isFinite)) return b;
  const before = dot2(e, e);
  const eNew = residuals(x, y, refined);
  const after = dot2(eNew, eNew);
  return after <= before ? refined : b;
}
