/**
 * Merging the gatherings of byte ranges read by worker threads (lib/readiness/node.ts): a
 * Scan's part as plain data, and adding a later part to a Scan so that it holds what one pass
 * over the whole file would.
 */
import { RowSample } from "./accumulators";
import { absorbColumn, columnPart, type ColumnPart } from "./column-part";
import { RowEncoder, buildDesign } from "./design";
import { HashSet64 } from "./hashing";
import { DUPLICATE_CAP, type Scan } from "./scan";
import { LeastSquares, PatternMoments } from "./stats";
import type { LeastSquaresJSON } from "./stats/least-squares";

type Sample = { count: number; rows: number[] };
type RawSet = ReturnType<HashSet64["raw"]>;

/** A Scan's gatherings as plain data, to send from a worker thread that read one byte range. */
export interface ScanPart {
  rowsTotal: number;
  rowsComplete: number;
  ragged: Sample;
  raggedWidths: [number, number][];
  duplicateRows: Sample;
  duplicateOf: [number, number][];
  rowSet: RawSet;
  keys: [number, { set: RawSet; dup: Sample; examples: [string, number][] }][];
  levels: Record<string, string[]>;
  designColumns: string[];
  ls: LeastSquaresJSON;
  pm: unknown | null;
  patterns: [string, number][];
  /** more distinct patterns than the cap in this part: none kept (then none in the whole file either) */
  patternsOverflowed: boolean;
  soleUnusable: number[];
  responseMissing: Sample;
  cols: ColumnPart[];
}

/** Everything gathered so far, as plain data (typed arrays can be transferred). */
export function scanPart(scan: Scan): ScanPart {
  const rs = (r: RowSample) => ({ count: r.count, rows: r.rows });
  const levels: Record<string, string[]> = {};
  for (const p of scan.predictors) if (p.kind === "category") levels[p.name] = [...p.levels];
  return {
    rowsTotal: scan.rowsTotal,
    rowsComplete: scan.rowsComplete,
    ragged: rs(scan.ragged),
    raggedWidths: [...scan.raggedWidths.entries()],
    duplicateRows: rs(scan.duplicateRows),
    duplicateOf: scan.duplicateOf,
    rowSet: scan.rowSet.raw(),
    keys: [...scan.keys.entries()].map(([k, v]) => [
      k,
      { set: v.set.raw(), dup: rs(v.dup), examples: [...v.examples.entries()] },
    ]),
    levels,
    designColumns: [...scan.design.columns],
    ls: scan.ls.toJSON() as LeastSquaresJSON,
    pm: scan.pm ? scan.pm.toJSON() : null,
    patterns: scan.patternMasks(),
    patternsOverflowed: scan.patternsOverflowed,
    soleUnusable: [...scan.soleUnusable],
    responseMissing: rs(scan.responseMissing),
    cols: scan.cols.map((c) => columnPart(c)),
  };
}

/**
 * Add the part of a later byte range of the same file (parts in file order); afterwards this
 * Scan holds what one pass over the whole file would (rows repeated across parts included).
 */
export function absorbPart(scan: Scan, p: ScanPart, first: boolean): void {
  scan.rowsTotal += p.rowsTotal;
  scan.rowsComplete += p.rowsComplete;
  scan.ragged.absorb(p.ragged);
  for (const [w, n] of p.raggedWidths) scan.raggedWidths.set(w, (scan.raggedWidths.get(w) ?? 0) + n);
  const mergeSet = (
    set: HashSet64,
    raw: RawSet,
    sample: RowSample,
    pairs: [number, number][] | null,
    partSample: Sample,
    partPairs: [number, number][],
  ): HashSet64 => {
    if (first) {
      sample.absorb(partSample);
      if (pairs) pairs.push(...partPairs.slice(0, scan.t.sampleRows - pairs.length));
      return HashSet64.fromRaw(raw, DUPLICATE_CAP);
    }
    const cross: number[] = [];
    const crossPairs: [number, number][] = [];
    // a row first seen in this part but repeating an earlier part's: its repeats inside this part repeat that earlier row
    const earlier = new Map<number, number>();
    const part = HashSet64.fromRaw(raw, DUPLICATE_CAP);
    // within the cap, the part's table is kept as it is, after the earlier parts' (no table grown
    // to hold them all); past it, its entries are added one by one, as one pass adds them until full
    const chained = set.entries + part.size <= DUPLICATE_CAP;
    part.forEach((h1, h2, line) => {
      const prev = chained ? set.lineOf(h1, h2) : set.addOrGet(h1, h2, line);
      if (prev) {
        cross.push(line);
        crossPairs.push([line, prev]);
        earlier.set(line, prev);
      }
    });
    if (chained) set.chain(part, cross.length);
    const rows = [...partSample.rows, ...cross].sort((a, b) => a - b).slice(0, scan.t.sampleRows);
    sample.absorb({ count: partSample.count + cross.length, rows });
    const inPart = partPairs.map(([l, p]): [number, number] => [l, earlier.get(p) ?? p]);
    if (pairs)
      pairs.push(
        ...[...inPart, ...crossPairs]
          .sort((a, b) => a[0] - b[0])
          .slice(0, Math.max(0, scan.t.sampleRows - pairs.length)),
      );
    return set;
  };
  scan.rowSet = mergeSet(
    scan.rowSet,
    p.rowSet,
    scan.duplicateRows,
    scan.duplicateOf,
    p.duplicateRows,
    p.duplicateOf,
  );
  for (const [k, v] of p.keys) {
    const mine = scan.keys.get(k);
    if (!mine) continue;
    mine.set = mergeSet(mine.set, v.set, mine.dup, null, v.dup, []);
    for (const [e, n] of v.examples)
      if (mine.examples.size < 10 || mine.examples.has(e))
        mine.examples.set(e, (mine.examples.get(e) ?? 0) + n);
  }
  // design: unite the level lists, then merge the least-squares factors on the united columns
  for (const pr of scan.predictors) {
    if (pr.kind !== "category") continue;
    for (const l of p.levels[pr.name] ?? []) if (!pr.levels.includes(l)) pr.levels.push(l);
  }
  const from = scan.design.columns;
  scan.design = buildDesign(scan.plan, scan.predictors, true);
  if (scan.design.columns.join("\u0000") !== from.join("\u0000"))
    scan.ls = scan.ls.expandColumns(from, scan.design.columns);
  let other = LeastSquares.fromJSON(p.ls);
  if (p.designColumns.join("\u0000") !== scan.design.columns.join("\u0000"))
    other = other.expandColumns(p.designColumns, scan.design.columns);
  scan.ls.merge(other);
  scan.levelIndex = scan.predictors.map((pr) => new Map(pr.levels.map((l, j) => [l, j])));
  scan.encoder = new RowEncoder(scan.plan, scan.predictors, scan.design, true);
  if (scan.pm && p.pm) scan.pm.merge(PatternMoments.fromJSON(p.pm));
  scan.absorbPatterns(p.patterns, p.patternsOverflowed);
  p.soleUnusable.forEach((v, i) => (scan.soleUnusable[i]! += v));
  scan.responseMissing.absorb(p.responseMissing);
  p.cols.forEach((c, i) => {
    const mine = scan.cols[i];
    if (mine) absorbColumn(mine, c);
  });
}
