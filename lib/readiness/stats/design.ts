/**
 * The fit preview and collinearity figures of a planned design, from a LeastSquares state.
 * Nothing inverts XᵀX: coefficients by back substitution on the triangular factor, standard
 * errors from the rows of R⁻¹, sums of squares from the rotated response Qᵀy.
 */
import type { CollinearityReport, Coefficient, FitReport } from "../report";
import type { LeastSquares } from "./least-squares";
import { aliasCombination, describeCombination, detectAliasing } from "./aliasing";
import {
  conditionDiagnostics,
  correlationFactor,
  correlationMatrix,
  termCollinearity,
  type TermGroup,
} from "./collinearity";
import { invertUpper, solveUpper, triangularise } from "./linalg";
import { refineCoefficients } from "./refine";
import { fUpper, tTwoSided } from "./distributions";
import { detectableR2 } from "./power";

export interface DesignSpec {
  /** design column names, "intercept" first when present */
  columns: string[];
  intercept: boolean;
  /** non-intercept terms: a categorical term = its indicator columns, an interaction a:b = its product columns */
  terms: { term: string; columns: string[]; df: number }[];
  /** design columns that are numeric predictors (pair-correlation check) */
  numericColumns: string[];
}

export interface DesignAnalysis {
  fit: FitReport;
  collinearity: CollinearityReport | null;
  rank: number;
  aliased: { term: string; combination: string }[];
}

function factorRows(ls: LeastSquares): number[][] {
  const K = ls.k + 1;
  const flat = ls.augmentedFactor();
  return Array.from({ length: K }, (_, i) => Array.from(flat.subarray(i * K, (i + 1) * K)));
}

function checkSpec(ls: LeastSquares, spec: DesignSpec): void {
  if (spec.columns.length !== ls.k) {
    throw new RangeError(
      `design spec names ${spec.columns.length} columns but the least-squares state has ${ls.k}`,
    );
  }
  if (new Set(spec.columns).size !== spec.columns.length)
    throw new RangeError("design spec repeats a column name");
  const known = new Set(spec.columns);
  for (const t of spec.terms) {
    for (const c of t.columns)
      if (!known.has(c))
        throw new RangeError(`term "${t.term}" lists column "${c}" that is not in the design`);
  }
}

/** Groups for (G)VIF: each predictor with the interaction columns that contain it (Fox & Monette 1992). */
function termGroups(spec: DesignSpec, position: Map<string, number>): TermGroup[] {
  const names = new Set(spec.terms.map((t) => t.term));
  const isInteraction = (t: string) => t.includes(":") && t.split(":").every((part) => names.has(part));
  const groups: TermGroup[] = [];
  for (const t of spec.terms) {
    if (isInteraction(t.term)) continue;
    const cols = [...t.columns];
    for (const other of spec.terms) {
      if (isInteraction(other.term) && other.term.split(":").includes(t.term)) cols.push(...other.columns);
    }
    const members = cols.map((c) => position.get(c)).filter((p): p is number => p !== undefined);
    groups.push({ term: t.term, members });
  }
  return groups;
}

/**
 * Fit, rank, aliasing and collinearity of the design held by `ls`.
 * F = ((TSS − RSS)/p)/(RSS/(n − p − 1)), p = rank − 1 with an intercept (rank without);
 * TSS is Σ(y − ȳ)² with an intercept and Σy² without (NIST NoInt convention).
 * When n ≤ rank (no residual df) rss, residualStdError and adjRSquared are 0 and F, its
 * p-value, standard errors, t and p-values are null.
 */
export function analyseDesign(
  ls: LeastSquares,
  spec: DesignSpec,
  opts: { alpha: number; power: number },
): DesignAnalysis {
  checkSpec(ls, spec);
  const k = ls.k;
  const a = factorRows(ls);
  const { kept, aliased: aliasedIdx, norms } = detectAliasing(a, k);
  const r = kept.length;
  const t =
    aliasedIdx.length === 0
      ? a
      : triangularise(
          a.map((row) => [...kept.map((j) => row[j] as number), row[k] as number]),
          r + 1,
        );
  const n = ls.n;
  const hasIntercept = spec.intercept && kept[0] === 0;
  const i0 = hasIntercept ? 1 : 0;
  const dfModel = r - i0;
  const dfResidual = n - r;
  const qty = t.slice(0, r + 1).map((row) => row[r] as number);
  let regSS = 0;
  for (let i = i0; i < r; i++) regSS += (qty[i] as number) ** 2;
  const rss = dfResidual > 0 ? (qty[r] as number) ** 2 : 0;
  const tss = regSS + rss;
  const rSquared = tss > 0 ? regSS / tss : 0;
  const sigma2 = dfResidual > 0 ? rss / dfResidual : NaN;
  const adjRSquared = dfResidual > 0 && tss > 0 ? 1 - ((1 - rSquared) * (n - i0)) / dfResidual : 0;
  const F = dfModel > 0 && dfResidual > 0 && rss > 0 ? regSS / dfModel / sigma2 : null;

  const beta = r > 0 ? refineCoefficients(ls.keptRows, k, kept, t, solveUpper(t, qty.slice(0, r), r)) : [];
  const rInv = r > 0 ? invertUpper(t, r) : [];
  const naming = {
    names: spec.columns,
    intercept: spec.intercept,
    termOf: new Map(
      spec.terms.flatMap((term) => term.columns.map((c) => [c, term.term] as [string, string])),
    ),
  };
  const aliased = aliasedIdx.map((j) => ({
    term: spec.columns[j] as string,
    combination: describeCombination(aliasCombination(a, kept, j), j, norms, naming),
  }));

  const keptPos = new Map(kept.map((j, p) => [j, p]));
  const coefficients: Coefficient[] = spec.columns.map((name, j) => {
    const p = keptPos.get(j);
    if (p === undefined)
      return { term: name, estimate: null, stdError: null, t: null, pValue: null, aliased: true };
    const estimate = beta[p] as number;
    if (!(dfResidual > 0)) return { term: name, estimate, stdError: null, t: null, pValue: null };
    let s = 0;
    for (const v of rInv[p] as number[]) s += v * v;
    const stdError = Math.sqrt(sigma2 * s);
    const tv = stdError > 0 ? estimate / stdError : null;
    return { term: name, estimate, stdError, t: tv, pValue: tv === null ? null : tTwoSided(tv, dfResidual) };
  });

  const fit: FitReport = {
    coefficients,
    rss,
    tss,
    rSquared,
    adjRSquared,
    residualStdError: dfResidual > 0 ? Math.sqrt(sigma2) : 0,
    F,
    dfModel,
    dfResidual,
    pValue: F === null ? null : fUpper(F, dfModel, dfResidual),
    power: {
      alpha: opts.alpha,
      power: opts.power,
      detectableR2: dfModel > 0 ? detectableR2(n, dfModel, opts.alpha, opts.power) : null,
    },
  };

  let collinearity: CollinearityReport | null = null;
  if (r > 0) {
    const cond = conditionDiagnostics(t, r);
    const keptNames = kept.map((j) => spec.columns[j] as string);
    let terms: CollinearityReport["terms"] = [];
    let corr: CollinearityReport["correlations"] = { columns: [], matrix: [] };
    if (hasIntercept && r > 1) {
      const u = correlationFactor(t, r);
      // position of each kept non-intercept column within U
      const position = new Map(kept.slice(1).map((j, p) => [spec.columns[j] as string, p]));
      terms = termCollinearity(u, termGroups(spec, position));
      corr = { columns: keptNames.slice(1), matrix: correlationMatrix(u) };
    }
    collinearity = {
      terms,
      correlations: corr,
      conditionIndices: cond.indices,
      varianceProportions: { columns: keptNames, matrix: cond.proportions },
      aliased,
    };
  }
  return { fit, collinearity, rank: r, aliased };
}
