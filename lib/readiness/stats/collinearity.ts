/**
 * Collinearity figures from the triangular factor of the kept design columns.
 * With the intercept first, the trailing block R₂₂ of the factor is the factor of the centred
 * columns (X_cᵀX_c = R₂₂ᵀR₂₂); scaling its columns to unit length gives U with UᵀU = the
 * correlation matrix, so VIF_j = ‖row j of U⁻¹‖² = diag(Corr⁻¹)_j (Marquardt 1970) and
 * GVIF = det(Corr₁₁)·det(Corr₂₂)/det(Corr) (Fox & Monette 1992) follow from triangular factors.
 * Condition indices and variance-decomposition proportions (Belsley, Kuh & Welsch 1980) use the
 * uncentred columns, intercept included, scaled to unit length.
 */
import { SVD, Matrix } from "ml-matrix";
import type { CollinearityReport } from "../report";
import { columnNorm, invertUpper, logDetGram } from "./linalg";

export interface TermGroup {
  term: string;
  /** positions in the kept non-intercept columns */
  members: number[];
}

/** U: the unit-length-scaled trailing block of the factor (rows/cols 1..r−1 of the r×r factor t). */
export function correlationFactor(t: number[][], r: number): number[][] {
  const m = r - 1;
  const u: number[][] = [];
  for (let i = 0; i < m; i++) u.push((t[i + 1] as number[]).slice(1, r));
  const norms = Array.from({ length: m }, (_, j) => columnNorm(u, j));
  return u.map((row) => row.map((v, j) => v / (norms[j] as number)));
}

export function termCollinearity(u: number[][], groups: TermGroup[]): CollinearityReport["terms"] {
  const m = u.length;
  if (m === 0) return [];
  const uInv = invertUpper(u, m);
  const vif = uInv.map((row) => row.reduce((s, v) => s + v * v, 0));
  const all = Array.from({ length: m }, (_, i) => i);
  const logDetAll = logDetGram(u, all);
  const out: CollinearityReport["terms"] = [];
  for (const g of groups) {
    if (g.members.length === 0) continue;
    const df = g.members.length;
    if (df === 1) {
      const v = vif[g.members[0] as number] as number;
      out.push({ term: g.term, df, vif: v, gvif: v, gvifScaled: Math.sqrt(v) });
      continue;
    }
    const inGroup = new Set(g.members);
    const rest = all.filter((i) => !inGroup.has(i));
    const gvif = Math.exp(logDetGram(u, g.members) + logDetGram(u, rest) - logDetAll);
    out.push({ term: g.term, df, gvif, gvifScaled: Math.pow(gvif, 1 / (2 * df)) });
  }
  return out;
}

export function correlationMatrix(u: number[][]): number[][] {
  const m = u.length;
  const c: number[][] = Array.from({ length: m }, () => new Array<number>(m).fill(0));
  for (let i = 0; i < m; i++) {
    for (let j = i; j < m; j++) {
      let s = 0;
      for (let l = 0; l <= Math.min(i, j); l++)
        s += ((u[l] as number[])[i] as number) * ((u[l] as number[])[j] as number);
      const v = i === j ? 1 : Math.max(-1, Math.min(1, s));
      (c[i] as number[])[j] = v;
      (c[j] as number[])[i] = v;
    }
  }
  return c;
}

/**
 * Condition indices η_k = d₁/d_k of the unit-length-scaled design and the proportions
 * π_kj = (v_jk²/d_k²)/Σ_k(v_jk²/d_k²); x: the r×r factor of the kept columns (same singular
 * values and right singular vectors as X).
 */
export function conditionDiagnostics(
  x: number[][],
  r: number,
): { indices: number[]; proportions: number[][] } {
  if (r === 0) return { indices: [], proportions: [] };
  const sub = x.slice(0, r).map((row) => row.slice(0, r));
  const norms = Array.from({ length: r }, (_, j) => columnNorm(sub, j));
  const scaled = sub.map((row) => row.map((v, j) => v / (norms[j] as number)));
  const svd = new SVD(new Matrix(scaled), {
    computeLeftSingularVectors: false,
    computeRightSingularVectors: true,
    autoTranspose: false,
  });
  const d = svd.diagonal;
  const v = svd.rightSingularVectors;
  const order = d.map((_, i) => i).sort((a, b) => (d[b] as number) - (d[a] as number));
  const d1 = d[order[0] as number] as number;
  const indices = order.map((k) => d1 / (d[k] as number));
  // phi[j][k] = v_jk² / d_k²
  const phi = Array.from({ length: r }, (_, j) =>
    order.map((k) => (v.get(j, k) * v.get(j, k)) / ((d[k] as number) * (d[k] as number))),
  );
  const totals = phi.map((row) => row.reduce((s, e) => s + e, 0));
  const proportions = order.map((_, kk) =>
    Array.from({ length: r }, (_, j) => ((phi[j] as number[])[kk] as number) / (totals[j] as number)),
  );
  return { indices, proportions };
}

/** Pairs of numeric predictors with |r| ≥ threshold (lib/readiness/CHECKS.md collinear.pair, default 0.9). */
export function highCorrelationPairs(
  report: CollinearityReport | null,
  numericColumns: string[],
  threshold = 0.9,
): { a: string; b: string; r: number }[] {
  if (!report) return [];
  const { columns, matrix } = report.correlations;
  const numeric = new Set(numericColumns);
  const out: { a: string; b: string; r: number }[] = [];
  for (let i = 0; i < columns.length; i++) {
    for (let j = i + 1; j < columns.length; j++) {
      const r = (matrix[i] as number[])[j] as number;
      if (
        numeric.has(columns[i] as string) &&
        numeric.has(columns[j] as string) &&
        Math.abs(r) >= threshold
      ) {
        out.push({ a: columns[i] as string, b: columns[j] as string, r });
      }
    }
  }
  return out;
}

/**
 * Dimensions with condition index η ≥ `index` in which two or more design columns have a
 * variance-decomposition proportion > `proportion` (Belsley, Kuh & Welsch 1980: 30 and 0.5).
 */
export function conditionFlags(
  report: CollinearityReport | null,
  index = 30,
  proportion = 0.5,
): { conditionIndex: number; columns: string[]; proportions: number[] }[] {
  if (!report) return [];
  const names = report.varianceProportions.columns;
  const out: { conditionIndex: number; columns: string[]; proportions: number[] }[] = [];
  report.conditionIndices.forEach((eta, k) => {
    if (!(eta >= index)) return;
    const row = report.varianceProportions.matrix[k] ?? [];
    const hit = row.map((p, j) => ({ p, j })).filter((e) => e.p > proportion);
    if (hit.length >= 2)
      out.push({
        conditionIndex: eta,
        columns: hit.map((e) => names[e.j] as string),
        proportions: hit.map((e) => e.p),
      });
  });
  return out;
}
