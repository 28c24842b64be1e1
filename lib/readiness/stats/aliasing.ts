/**
 * Rank and aliasing of a design from its triangular factor. Columns are scaled to unit length
 * and taken in order; a column whose component orthogonal to the columns kept so far has
 * relative length ≤ tolerance is aliased (a linear combination of earlier columns). The
 * tolerance is far below R's 1e-7 so that ill-conditioned but full-rank designs (NIST
 * Longley, Filip-like polynomials) stay full rank.
 */
import { columnNorm, solveUpper, triangularise } from "./linalg";

export const ALIAS_TOLERANCE = 1e-10;

export interface AliasingResult {
  kept: number[];
  aliased: number[];
  /** Euclidean length of each design column of X (0 for a column of zeros) */
  norms: number[];
}

/** a: the (k+1)×(k+1) augmented factor as rows; k design columns. */
export function detectAliasing(a: number[][], k: number, tol = ALIAS_TOLERANCE): AliasingResult {
  const rows = a.length;
  const norms: number[] = [];
  for (let j = 0; j < k; j++) norms.push(columnNorm(a, j));
  const kept: number[] = [];
  const aliased: number[] = [];
  const reflectors: { v: number[]; vv: number }[] = [];
  for (let j = 0; j < k; j++) {
    const nj = norms[j] as number;
    if (!(nj > 0)) {
      aliased.push(j);
      continue;
    }
    const x = a.map((row) => (row[j] as number) / nj);
    reflectors.forEach(({ v, vv }, p) => {
      let dot = 0;
      for (let i = p; i < rows; i++) dot += (v[i - p] as number) * (x[i] as number);
      const f = (2 * dot) / vv;
      for (let i = p; i < rows; i++) x[i] = (x[i] as number) - f * (v[i - p] as number);
    });
    const t = reflectors.length;
    let resid = 0;
    for (let i = t; i < rows; i++) resid = Math.hypot(resid, x[i] as number);
    if (resid <= tol || t >= rows) {
      aliased.push(j);
      continue;
    }
    const v = x.slice(t);
    const alpha = (v[0] as number) > 0 ? -resid : resid;
    v[0] = (v[0] as number) - alpha;
    let vv = 0;
    for (const e of v) vv += e * e;
    reflectors.push({ v, vv });
    kept.push(j);
  }
  return { kept, aliased, norms };
}

/** Coefficients c with x_j ≈ Σ c_i x_i over the kept columns before j (least squares on the factor). */
export function aliasCombination(
  a: number[][],
  kept: number[],
  j: number,
): { column: number; coef: number }[] {
  const before = kept.filter((i) => i < j);
  if (before.length === 0) return [];
  const cols = [...before, j];
  const sub = a.map((row) => cols.map((c) => row[c] as number));
  const r = triangularise(sub, cols.length);
  const z = r.slice(0, before.length).map((row) => row[before.length] as number);
  const coef = solveUpper(r, z, before.length);
  return before.map((column, i) => ({ column, coef: coef[i] as number }));
}

function shortNumber(x: number): string {
  const s = Number(Math.abs(x).toPrecision(4));
  return s >= 1e-4 && s < 1e6 ? String(s) : s.toExponential(3).replace(/\.?0+e/, "e");
}

export interface AliasNaming {
  names: string[];
  intercept: boolean;
  /** design column → its term, for naming the indicator trap */
  termOf: Map<string, string>;
}

/** Plain-words combination, e.g. "irrigation + rainfall", "2·a − 0.5·b + 3". */
export function describeCombination(
  parts: { column: number; coef: number }[],
  j: number,
  norms: number[],
  naming: AliasNaming,
): string {
  const nj = norms[j] as number;
  if (!(nj > 0)) return "0 (the column is all zeros on the complete cases)";
  const significant = parts.filter((p) => Math.abs(p.coef) * (norms[p.column] as number) > 1e-8 * nj);
  const isIntercept = (c: number) => naming.intercept && c === 0;
  const others = significant.filter((p) => !isIntercept(p.column));
  const constant = significant.filter((p) => isIntercept(p.column));
  // "1 − a − b" reads better than "−a − b + 1"; otherwise the constant goes last ("2·a + 3")
  const ordered =
    others.length > 0 && (others[0] as { coef: number }).coef < 0
      ? [...constant, ...others]
      : [...others, ...constant];
  let text = "";
  ordered.forEach((p, idx) => {
    const neg = p.coef < 0;
    const mag = shortNumber(p.coef);
    const name = naming.names[p.column] as string;
    const body = isIntercept(p.column) ? mag : mag === "1" ? name : `${mag}·${name}`;
    text += idx === 0 ? (neg ? `−${body}` : body) : neg ? ` − ${body}` : ` + ${body}`;
  });
  if (ordered.length === 0) return "0";
  if (ordered.length === 1 && isIntercept((ordered[0] as { column: number }).column)) {
    return `${text} (the column is constant on the complete cases)`;
  }
  const indicatorTerm = (c: number): string | null => {
    const name = naming.names[c] as string;
    const term = naming.termOf.get(name);
    return term && !term.includes(":") && name.startsWith(`${term}[`) ? term : null;
  };
  const target = indicatorTerm(j);
  const trap =
    target !== null &&
    ordered.some((p) => isIntercept(p.column)) &&
    ordered.every(
      (p) =>
        (isIntercept(p.column) || indicatorTerm(p.column) !== null) && Math.abs(Math.abs(p.coef) - 1) < 1e-6,
    );
  if (trap) {
    return `${text} (indicator trap: these indicator columns add up to the intercept column; typically the baseline level has no complete cases)`;
  }
  return text;
}
