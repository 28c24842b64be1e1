/**
 * One column's gatherings as plain data, and their merge (parts of a file in file order):
 * used when worker threads read byte ranges of a large file (lib/readiness/node.ts).
 */
import { RowSample, type MomentsJSON } from "./accumulators";
import { LEVEL_CAP, OFFENDER_CAP, type ColumnScan, type InferCounts, type LevelAcc } from "./column-scan";
import { absorbInfer } from "./column-types";

/** Everything this column gathered, as plain data (to send from a worker thread). */
export function columnPart(c: ColumnScan): ColumnPart {
  const rs = (r: RowSample) => ({ count: r.count, rows: r.rows });
  return {
    total: c.total,
    missing: rs(c.missing),
    infer: { ...c.infer, log: c.infer.log.slice(0, c.infer.seen) },
    levels: c.levels ? [...c.levels.entries()] : null,
    levelOverflow: c.levelOverflow,
    moments: c.moments.toJSON(),
    quant: c.quant ? c.quant.part() : null,
    mismatch: rs(c.mismatch),
    offenders: [...c.offenders.entries()],
    comma: rs(c.comma),
    commaExamples: c.commaExamples,
    range: rs(c.range),
    rangeExamples: c.rangeExamples,
    sentinels: [...c.sentinels.entries()].map(
      ([v, r]) => [v, rs(r)] as [number, { count: number; rows: number[] }],
    ),
    lo: c.lo,
    hi: c.hi,
    date: {
      a13: c.date.a13,
      b13: c.date.b13,
      pairs: c.date.pairs,
      ambiguous: c.date.ambiguous ? rs(c.date.ambiguous) : null,
    },
  };
}

/** Add a later part of the same column (parts in file order): the result is that of one pass. */
export function absorbColumn(c: ColumnScan, p: ColumnPart): void {
  c.total += p.total;
  c.missing.absorb(p.missing);
  absorbInfer(c.infer, p.infer);
  if (c.levels && p.levels) {
    for (const [l, a] of p.levels) {
      const mine = c.levels.get(l);
      if (mine) {
        mine.count += a.count;
        mine.complete += a.complete;
        for (const r of a.rows) if (mine.rows.length < c.sampleCap) mine.rows.push(r);
      } else if (c.levels.size < LEVEL_CAP)
        c.levels.set(l, { count: a.count, complete: a.complete, rows: a.rows.slice(0, c.sampleCap) });
      else c.levelOverflow += a.count;
    }
  }
  c.levelOverflow += p.levelOverflow;
  c.moments.merge(p.moments);
  if (c.quant && p.quant) c.quant.absorb(p.quant);
  c.mismatch.absorb(p.mismatch);
  for (const [v, n] of p.offenders) {
    const k = c.offenders.get(v);
    if (k !== undefined) c.offenders.set(v, k + n);
    else if (c.offenders.size < OFFENDER_CAP) c.offenders.set(v, n);
  }
  c.comma.absorb(p.comma);
  for (const e of p.commaExamples)
    if (c.commaExamples.length < 5 && !c.commaExamples.includes(e)) c.commaExamples.push(e);
  c.range.absorb(p.range);
  for (const e of p.rangeExamples)
    if (c.rangeExamples.length < 5 && !c.rangeExamples.includes(e)) c.rangeExamples.push(e);
  for (const [v, r] of p.sentinels) {
    let mine = c.sentinels.get(v);
    if (!mine) c.sentinels.set(v, (mine = new RowSample(c.sampleCap)));
    mine.absorb(r);
  }
  c.lo = mergeExtreme(c.lo, p.lo, 1, c.sampleCap);
  c.hi = mergeExtreme(c.hi, p.hi, -1, c.sampleCap);
  c.date.a13 += p.date.a13;
  c.date.b13 += p.date.b13;
  c.date.pairs += p.date.pairs;
  if (c.date.ambiguous && p.date.ambiguous) c.date.ambiguous.absorb(p.date.ambiguous);
}

type Extreme = { v: number; count: number; rows: number[]; next: number };

/** Merge the smallest (dir 1) or largest (dir −1) value trackers of two parts. */
function mergeExtreme(a: Extreme, b: Extreme, dir: 1 | -1, cap: number): Extreme {
  const better = (x: number, y: number) => (dir === 1 ? x < y : x > y);
  const pick = (...xs: number[]) => xs.reduce((m, x) => (better(x, m) ? x : m));
  if (a.count === 0) return { ...b, rows: [...b.rows] };
  if (b.count === 0) return a;
  if (a.v === b.v)
    return {
      v: a.v,
      count: a.count + b.count,
      rows: [...a.rows, ...b.rows].slice(0, cap),
      next: pick(a.next, b.next),
    };
  if (better(a.v, b.v)) return { ...a, next: pick(a.next, b.v) };
  return { ...b, rows: [...b.rows], next: pick(b.next, a.v) };
}

export interface ColumnPart {
  total: number;
  missing: { count: number; rows: number[] };
  infer: InferCounts;
  levels: [string, LevelAcc][] | null;
  levelOverflow: number;
  moments: MomentsJSON;
  quant: { values: Float64Array; keys: Uint32Array; seen: number } | null;
  mismatch: { count: number; rows: number[] };
  offenders: [string, number][];
  comma: { count: number; rows: number[] };
  commaExamples: string[];
  range: { count: number; rows: number[] };
  rangeExamples: number[];
  sentinels: [number, { count: number; rows: number[] }][];
  lo: Extreme;
  hi: Extreme;
  date: { a13: number; b13: number; pairs: number; ambiguous: { count: number; rows: number[] } | null };
}
