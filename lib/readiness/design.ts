/**
 * The planned design matrix: which columns the model has and how one row becomes a row of X.
 * Treatment coding: a category with levels L₀ (baseline), L₁…L_{k−1} gives indicator columns
 * `name[L₁]`…`name[L_{k−1}]`; an interaction a:b gives the products of a's and b's columns.
 */
import type { Plan, PlanColumn } from "./plan";

export interface DesignTerm {
  term: string;
  columns: string[];
  df: number;
}

/** Same shape as the numerics' DesignSpec (lib/readiness/stats). */
export interface Design {
  columns: string[];
  intercept: boolean;
  terms: DesignTerm[];
  /** design columns of numeric and boolean predictors (for pairwise correlations) */
  numericColumns: string[];
}

export interface Predictor {
  name: string;
  col: PlanColumn;
  kind: "numeric" | "boolean" | "category";
  /** category: levels in design order, baseline first */
  levels: string[];
  /** category: levels outside the list may appear and become columns */
  open: boolean;
}

/** The predictors of a plan, with each category's level order (baseline first). */
export function predictorsOf(plan: Plan, extraLevels: Record<string, string[]> = {}): Predictor[] {
  return plan.columns
    .filter((c) => c.role === "predictor")
    .map((c) => {
      if (c.type !== "category")
        return {
          name: c.name,
          col: c,
          kind: c.type === "boolean" ? "boolean" : "numeric",
          levels: [],
          open: false,
        } as Predictor;
      const listed = c.levels ?? [];
      const all = [...listed];
      for (const l of extraLevels[c.name] ?? []) if (!all.includes(l)) all.push(l);
      const base = c.baseline ?? all[0];
      const levels = base === undefined ? all : [base, ...all.filter((l) => l !== base)];
      return {
        name: c.name,
        col: c,
        kind: "category",
        levels,
        open: c.openLevels === true || listed.length === 0,
      } as Predictor;
    });
}

function termColumns(p: Predictor, full: boolean): string[] {
  if (p.kind !== "category") return [p.name];
  return p.levels.slice(full ? 0 : 1).map((l) => `${p.name}[${l}]`);
}

/**
 * Build the design from the plan and the level lists in force. `full` keeps an indicator for
 * every level, the baseline's too: the engine state is stored that way, so that dropping the
 * baseline's columns later gives the treatment-coded fit for any baseline (pooling batches
 * whose open level lists start differently, or a plan whose baseline changed).
 */
export function buildDesign(plan: Plan, predictors: Predictor[], full = false): Design {
  const terms: DesignTerm[] = [];
  const byName = new Map(predictors.map((p) => [p.name, p]));
  for (const p of predictors) {
    const cols = termColumns(p, full);
    terms.push({ term: p.name, columns: cols, df: cols.length });
  }
  for (const [a, b] of plan.interactions) {
    const pa = byName.get(a);
    const pb = byName.get(b);
    if (!pa || !pb) continue;
    const cols: string[] = [];
    for (const ca of termColumns(pa, full)) for (const cb of termColumns(pb, full)) cols.push(`${ca}:${cb}`);
    terms.push({ term: `${a}:${b}`, columns: cols, df: cols.length });
  }
  const columns = [...(plan.intercept ? ["intercept"] : []), ...terms.flatMap((t) => t.columns)];
  const numericColumns = predictors.filter((p) => p.kind !== "category").map((p) => p.name);
  return { columns, intercept: plan.intercept, terms, numericColumns };
}

/**
 * Encodes parsed predictor values into a design row. `values[i]` is the number of predictor i,
 * or for a category the index of its level in `predictors[i].levels`.
 */
export class RowEncoder {
  readonly x: Float64Array;
  private offsets: number[] = [];
  private inter: { a: number; b: number; offset: number; nb: number }[] = [];
  constructor(
    plan: Plan,
    private predictors: Predictor[],
    design: Design,
    private full = false,
  ) {
    this.x = new Float64Array(design.columns.length);
    let off = plan.intercept ? 1 : 0;
    for (const p of predictors) {
      this.offsets.push(off);
      off += p.kind === "category" ? p.levels.length - (full ? 0 : 1) : 1;
    }
    const index = new Map(predictors.map((p, i) => [p.name, i]));
    for (const [a, b] of plan.interactions) {
      const ia = index.get(a);
      const ib = index.get(b);
      if (ia === undefined || ib === undefined) continue;
      const nb = this.width(ib);
      this.inter.push({ a: ia, b: ib, offset: off, nb });
      off += this.width(ia) * nb;
    }
    if (plan.intercept) this.x[0] = 1;
  }
  private width(i: number): number {
    const p = this.predictors[i]!;
    return p.kind === "category" ? p.levels.length - (this.full ? 0 : 1) : 1;
  }
  /** Fill this.x from the values; returns this.x. */
  encode(values: ArrayLike<number>): Float64Array {
    const x = this.x;
    const ps = this.predictors;
    for (let i = 0; i < ps.length; i++) {
      const off = this.offsets[i]!;
      const v = values[i]!;
      if (ps[i]!.kind === "category") {
        const shift = this.full ? 0 : 1;
        const w = ps[i]!.levels.length - shift;
        for (let j = 0; j < w; j++) x[off + j] = 0;
        if (v >= shift) x[off + v - shift] = 1;
      } else x[off] = v;
    }
    for (const it of this.inter) {
      const wa = this.width(it.a);
      const nb = it.nb;
      const oa = this.offsets[it.a]!;
      const ob = this.offsets[it.b]!;
      for (let i = 0; i < wa; i++)
        for (let j = 0; j < nb; j++) x[it.offset + i * nb + j] = x[oa + i]! * x[ob + j]!;
    }
    return x;
  }
}
