/**
 * The serialisable engine state of one batch: everything the model-level figures need,
 * small enough to store beside the report and merge into a pool without reading files again.
 */
import { Moments, type MomentsJSON } from "./accumulators";
import type { ColumnReport } from "./report";
import type { Scan } from "./scan";
import { LeastSquares, PatternMoments } from "./stats";
import type { LeastSquaresJSON } from "./stats/least-squares";

export const STATE_KIND = "tributary-engine-state";
/** values per column kept in the state for pooled quartiles */
export const STATE_SAMPLE = 512;
/** characters of missingness masks a scan or a state keeps (one per model column per pattern) */
export const PATTERN_CHARS = 4_000_000;

/**
 * The most distinct missingness patterns kept over m model columns. Beyond it the masks are
 * dropped and `overflowed` set: gaps in scattered combinations (each row its own pattern) would
 * otherwise grow with the rows, and the state with them. Whether a file passes it does not
 * depend on how the file was cut into parts.
 */
export function patternLimit(m: number): number {
  return Math.max(1, Math.floor(PATTERN_CHARS / Math.max(1, m)));
}

export interface ColumnState {
  name: string;
  inferredType: ColumnReport["inferredType"];
  total: number;
  missing: number;
  moments: MomentsJSON | null;
  /** up to STATE_SAMPLE values spread over the column's distribution, with the count they stand for */
  sample: { values: number[]; weight: number };
  /** [level, rows, complete cases] */
  levels: [string, number, number][] | null;
  levelOverflow: number;
}

export interface EngineState {
  kind: typeof STATE_KIND;
  version: 1;
  engineVersion: string;
  planHash: string;
  header: string[];
  rows: { total: number; complete: number };
  design: { columns: string[]; levels: Record<string, string[]> };
  ls: LeastSquaresJSON;
  pm: unknown | null;
  /**
   * missingness patterns over the model columns (response first), "1" = missing; `overflowed`
   * (masks then empty) when there were more than patternLimit(columns) distinct ones
   */
  patterns: { columns: string[]; masks: [string, number][]; overflowed?: true };
  /** rows made incomplete by this model column alone, aligned with patterns.columns */
  soleUnusable: number[];
  responseMissing: number;
  columns: ColumnState[];
}

export function stateOf(scan: Scan, engineVersion: string, planHash: string): EngineState {
  const levels: Record<string, string[]> = {};
  for (const p of scan.predictors) if (p.kind === "category") levels[p.name] = [...p.levels];
  return {
    kind: STATE_KIND,
    version: 1,
    engineVersion,
    planHash,
    header: scan.header.map((h) => h.trim()),
    rows: { total: scan.rowsTotal, complete: scan.rowsComplete },
    design: { columns: [...scan.design.columns], levels },
    ls: scan.ls.toJSON() as LeastSquaresJSON,
    pm: scan.pm ? scan.pm.toJSON() : null,
    patterns: {
      columns: scan.model.map((m) => m.name),
      masks: scan.patternMasks(),
      ...(scan.patternsOverflowed ? { overflowed: true as const } : {}),
    },
    soleUnusable: [...scan.soleUnusable],
    responseMissing: scan.responseMissing.count,
    columns: scan.cols.map((c) => ({
      name: c.name,
      inferredType: c.inferredType(),
      total: c.total,
      missing: c.missing.count,
      moments: c.moments.n > 0 ? c.moments.toJSON() : null,
      sample: { values: c.quant ? c.quant.sample(STATE_SAMPLE) : [], weight: c.moments.n },
      levels: c.levels
        ? [...c.levels.entries()].map(([l, a]) => [l, a.count, a.complete] as [string, number, number])
        : null,
      levelOverflow: c.levelOverflow,
    })),
  };
}

/** Check that a stored value is an engine state (states come back from the database). */
export function isEngineState(s: unknown): s is EngineState {
  return (
    typeof s === "object" &&
    s !== null &&
    (s as EngineState).kind === STATE_KIND &&
    (s as EngineState).version === 1
  );
}

function mergeColumn(a: ColumnState, b: ColumnState): ColumnState {
  const m = Moments.fromJSON(a.moments ?? { n: 0, mean: 0, m2: 0, min: Infinity, max: -Infinity });
  if (b.moments) m.merge(b.moments);
  // pooled sample: each side's values carry its weight; resample to STATE_SAMPLE by weighted quantiles
  const pts: [number, number][] = [];
  for (const s of [a.sample, b.sample])
    for (const v of s.values) pts.push([v, s.weight / Math.max(1, s.values.length)]);
  pts.sort((x, y) => x[0] - y[0]);
  const totalW = pts.reduce((t, p) => t + p[1], 0);
  const values: number[] = [];
  if (pts.length <= STATE_SAMPLE) values.push(...pts.map((p) => p[0]));
  else {
    let acc = 0;
    let k = 0;
    for (const [v, w] of pts) {
      acc += w;
      while (k < STATE_SAMPLE && ((k + 0.5) * totalW) / STATE_SAMPLE <= acc) {
        values.push(v);
        k++;
      }
    }
  }
  let levels: ColumnState["levels"] = null;
  if (a.levels || b.levels) {
    const map = new Map<string, [number, number]>();
    for (const l of [...(a.levels ?? []), ...(b.levels ?? [])]) {
      const e = map.get(l[0]) ?? [0, 0];
      map.set(l[0], [e[0] + l[1], e[1] + l[2]]);
    }
    levels = [...map.entries()].map(([l, [c, cc]]) => [l, c, cc]);
  }
  return {
    name: a.name,
    inferredType:
      a.inferredType === b.inferredType || b.inferredType === "empty"
        ? a.inferredType
        : a.inferredType === "empty"
          ? b.inferredType
          : a.inferredType,
    total: a.total + b.total,
    missing: a.missing + b.missing,
    moments: m.n > 0 ? m.toJSON() : null,
    sample: { values, weight: m.n },
    levels,
    levelOverflow: a.levelOverflow + b.levelOverflow,
  };
}

/**
 * Merge states of batches checked against the same plan. Design columns are united (a level
 * one batch lacks is a zero column there) before the least-squares factors are merged.
 */
export function mergeStates(
  states: EngineState[],
  designColumns: (levels: Record<string, string[]>) => string[],
): EngineState {
  if (states.length === 0) throw new RangeError("mergeStates needs at least one state");
  const levels: Record<string, string[]> = {};
  for (const s of states) {
    for (const [k, ls] of Object.entries(s.design.levels)) {
      const out = (levels[k] ??= []);
      for (const l of ls) if (!out.includes(l)) out.push(l);
    }
  }
  const columns = designColumns(levels);
  let ls: LeastSquares | null = null;
  for (const s of states) {
    let part = LeastSquares.fromJSON(s.ls);
    if (part.k !== columns.length || s.design.columns.some((c, i) => c !== columns[i]))
      part = part.expandColumns(s.design.columns, columns);
    if (!ls) ls = part;
    else ls.merge(part);
  }
  let pm: PatternMoments | null = null;
  for (const s of states) {
    if (!s.pm) continue;
    const p = PatternMoments.fromJSON(s.pm);
    if (!pm) pm = p;
    else pm.merge(p);
  }
  const header: string[] = [];
  const byName = new Map<string, ColumnState>();
  for (const s of states) {
    for (const c of s.columns) {
      const prior = byName.get(c.name);
      if (!prior) {
        header.push(c.name);
        byName.set(c.name, c);
      } else byName.set(c.name, mergeColumn(prior, c));
    }
  }
  const first = states[0]!;
  const masks = new Map<string, number>();
  const sole = first.patterns.columns.map(() => 0);
  let overflowed = false;
  for (const s of states) {
    const same = s.patterns.columns.join("\u0000") === first.patterns.columns.join("\u0000");
    if (!same) continue;
    overflowed ||= s.patterns.overflowed === true;
    if (!overflowed) for (const [m, c] of s.patterns.masks) masks.set(m, (masks.get(m) ?? 0) + c);
    overflowed ||= masks.size > patternLimit(first.patterns.columns.length);
    s.soleUnusable.forEach((v, i) => (sole[i]! += v));
  }
  if (overflowed) masks.clear();
  return {
    kind: STATE_KIND,
    version: 1,
    engineVersion: first.engineVersion,
    planHash: first.planHash,
    header,
    rows: {
      total: states.reduce((t, s) => t + s.rows.total, 0),
      complete: states.reduce((t, s) => t + s.rows.complete, 0),
    },
    design: { columns, levels },
    ls: ls!.toJSON() as LeastSquaresJSON,
    pm: pm ? pm.toJSON() : null,
    patterns: {
      columns: first.patterns.columns,
      masks: [...masks.entries()],
      ...(overflowed ? { overflowed: true as const } : {}),
    },
    soleUnusable: sole,
    responseMissing: states.reduce((t, s) => t + s.responseMissing, 0),
    columns: header.map((h) => byName.get(h)!),
  };
}
