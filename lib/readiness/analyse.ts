/**
 * From an engine state (one batch, or the merged pool) to the model-level parts of the report:
 * column summaries, the model and its terms, missingness, the fit preview, collinearity,
 * sample-size rules and their findings.
 */
import { Moments, quantile } from "./accumulators";
import { buildDesign, predictorsOf, type Design } from "./design";
import { missingFindings, levelFindings, type Evidence } from "./findings-data";
import { collinearityFindings, dfFindings } from "./findings-model";
import type { Plan, Thresholds } from "./plan";
import { selectionBudget } from "./pooling/terms";
import type { ColumnReport, Finding, ReadinessReport } from "./report";
import { patternLimit, type EngineState } from "./state";
import {
  LeastSquares,
  PatternMoments,
  analyseDesign,
  greenRules,
  littleMcar,
  rileyContinuous,
} from "./stats";

export type Summary = NonNullable<ColumnReport["summary"]>;

export interface Analysis {
  rows: ReadinessReport["rows"];
  model: ReadinessReport["model"];
  columns: ColumnReport[];
  missingness: ReadinessReport["missingness"];
  collinearity: ReadinessReport["collinearity"];
  fit: ReadinessReport["fit"];
  sampleSize: ReadinessReport["sampleSize"];
  findings: Finding[];
  design: Design;
}

/** The design in force for a state: the plan's predictors with the state's level lists. */
export function designOf(plan: Plan, levels: Record<string, string[]>, full = false): Design {
  const preds = predictorsOf(plan);
  for (const p of preds) {
    if (p.kind !== "category") continue;
    for (const l of levels[p.name] ?? []) if (!p.levels.includes(l)) p.levels.push(l);
    // an open list without a planned baseline: the first level seen is the baseline
    if (p.col.baseline === undefined && (p.col.levels ?? []).length === 0)
      p.levels = [...(levels[p.name] ?? [])];
  }
  return buildDesign(plan, preds, full);
}

function summaryFromSample(m: Moments, values: number[]): Summary {
  const s = Float64Array.from(values).sort();
  return {
    min: m.min,
    q1: quantile(s, 0.25),
    median: quantile(s, 0.5),
    q3: quantile(s, 0.75),
    max: m.max,
    mean: m.mean,
    sd: m.sd,
  };
}

export function analyse(
  state: EngineState,
  plan: Plan,
  t: Thresholds,
  opts: { evidence?: Evidence | null; summaries?: Map<string, { summary: Summary; exact: boolean }> } = {},
): Analysis {
  const ev = opts.evidence ?? null;
  const planByName = new Map(plan.columns.map((c) => [c.name, c]));
  const findings: Finding[] = [];

  // columns
  const columns: ColumnReport[] = state.columns.map((c) => {
    const pc = planByName.get(c.name) ?? null;
    const r: ColumnReport = {
      name: c.name,
      inferredType: c.inferredType,
      plannedType: pc?.type ?? null,
      role: pc?.role ?? null,
      missing: { count: c.missing, fraction: c.total > 0 ? c.missing / c.total : 0 },
    };
    const showLevels = pc
      ? pc.type === "category"
      : c.inferredType === "category" || c.inferredType === "boolean";
    if (c.levels && showLevels) {
      r.levels = [...c.levels]
        .filter((l) => l[1] > 0)
        .sort((a, b) => b[1] - a[1])
        .slice(0, 100)
        .map(([level, count]) => ({ level, count }));
    }
    const numeric = pc
      ? pc.type === "number" || pc.type === "integer"
      : c.inferredType === "number" || c.inferredType === "integer";
    if (numeric && c.moments && c.moments.n > 0) {
      const live = opts.summaries?.get(c.name);
      if (live) {
        r.summary = live.summary;
        r.quartiles = live.exact ? "exact" : "sample";
      } else {
        r.summary = summaryFromSample(Moments.fromJSON(c.moments), c.sample.values);
        r.quartiles = c.sample.values.length >= c.moments.n ? "exact" : "sample";
      }
    }
    return r;
  });

  // model
  const design = designOf(plan, state.design.levels);
  const present = new Set(state.header);
  const ready = plan.columns
    .filter((c) => c.role === "response" || c.role === "predictor")
    .every((c) => present.has(c.name));
  let ls = LeastSquares.fromJSON(state.ls);
  if (state.design.columns.join("\u0000") !== design.columns.join("\u0000"))
    ls = ls.expandColumns(state.design.columns, design.columns);
  const n = ls.n;
  let fit: ReadinessReport["fit"] = null;
  let collinearity: ReadinessReport["collinearity"] = null;
  let rank = design.columns.length;
  let aliased: { term: string; combination: string }[] = [];
  if (ready && n > 0) {
    const a = analyseDesign(ls, design, { alpha: t.alpha, power: t.power });
    fit = a.fit;
    collinearity = a.collinearity;
    rank = a.rank;
    aliased = a.aliased;
  }
  const p = Math.max(0, rank - (plan.intercept ? 1 : 0));
  const residualDf = n - p - (plan.intercept ? 1 : 0);
  const sampleSize: ReadinessReport["sampleSize"] = {};
  if (p > 0) sampleSize.green = greenRules(p);
  if (p > 0 && plan.anticipatedR2 !== undefined)
    sampleSize.riley = rileyContinuous(p, plan.anticipatedR2, plan.outcome);
  if (plan.selection) sampleSize.selection = selectionBudget(plan, design.terms);

  // missingness
  let littleMCAR: { statistic: number; df: number; pValue: number } | undefined;
  if (state.pm) {
    const r = littleMcar(PatternMoments.fromJSON(state.pm));
    if (r) littleMCAR = r;
  }
  const patterns = [...state.patterns.masks]
    .sort((x, y) => y[1] - x[1])
    .slice(0, 20)
    .map(([mask, count]) => ({ columns: state.patterns.columns.filter((_, i) => mask[i] === "1"), count }));

  findings.push(...missingFindings(state, plan, t, ev, littleMCAR ?? null));
  findings.push(...levelFindings(state, plan, t, ev));
  // indicator columns of levels without complete rows are aliased as zero columns; level findings explain them
  const empty = new Set<string>();
  const byName = new Map(state.columns.map((c) => [c.name, c]));
  for (const [name, lv] of Object.entries(state.design.levels)) {
    const counts = new Map((byName.get(name)?.levels ?? []).map((l) => [l[0], l[2]]));
    for (const l of lv) if ((counts.get(l) ?? 0) === 0) empty.add(`${name}[${l}]`);
  }
  for (const c of design.columns) if (c.split(":").some((part) => empty.has(part))) empty.add(c);
  if (ready && n > 0) findings.push(...collinearityFindings(collinearity, aliased, design, plan, t, empty));
  findings.push(...dfFindings(n, p, residualDf, plan, t, sampleSize, fit, ready));

  return {
    rows: { total: state.rows.total, complete: n },
    model: {
      parameters: p,
      residualDf,
      perParameter: p > 0 ? n / p : null,
      terms: design.terms.map((tm) => ({ term: tm.term, columns: tm.columns, df: tm.df })),
      dfTarget: t.dfTarget ?? t.dfFloor,
    },
    columns,
    missingness: {
      patterns,
      ...(state.patterns.overflowed
        ? { patternsOverflow: { limit: patternLimit(state.patterns.columns.length) } }
        : {}),
      ...(littleMCAR ? { littleMCAR } : {}),
    },
    collinearity,
    fit,
    sampleSize,
    findings,
    design,
  };
}
