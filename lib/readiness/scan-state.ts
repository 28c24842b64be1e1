/**
 * What the single pass keeps (./scan.ts reads the rows into it): the header's columns and
 * their scans, duplicate tables, the planned model's design, factor and missingness patterns.
 */
import { RowSample } from "./accumulators";
import { Hash64, HashSet64 } from "./hashing";
import { ColumnScan } from "./column-scan";
import type { CsvMeta } from "./csv-reader";
import { RowEncoder, buildDesign, predictorsOf, type Design, type Predictor } from "./design";
import { thresholdsOf, type Plan, type Thresholds } from "./plan";
import { patternLimit } from "./state";
import { LeastSquares, PatternMoments } from "./stats";

/** total values kept for exact quartiles across all columns (12 bytes each, with their priorities) */
export const QUANTILE_BUDGET = 1_000_000;
/**
 * Per-column bound of exact quartiles; beyond it a uniform sample of this size (QuantileStore),
 * a quartile's standard error about 0.87·IQR/√50,000 ≈ 0.004·IQR. Until 2026-12-04 the bound
 * was 200,000: the kept values then took a fifth of a large check's time and 40–60 MB.
 */
export const QUANTILE_COLUMN_CAP = 50_000;
/** distinct rows (and keys) hashed for duplicate detection; 20–40 bytes each */
export const DUPLICATE_CAP = 4_000_000;
/** levels an open-list predictor may add as design columns; later new levels make rows incomplete */
export const MAX_OPEN_LEVELS = 200;
/** widest design the least-squares state may grow to by open levels (its memory is k²) */
export const MAX_DESIGN_COLUMNS = 1000;

export interface ModelColumn {
  name: string;
  /** header index, or -1 when the column is absent */
  index: number;
}

/** A planned key column's repeats: its hash table, the repeated rows, the first repeated values. */
export interface ScanKey {
  set: HashSet64;
  dup: RowSample;
  examples: Map<string, number>;
  /** the line of the earlier row with the key just read (0: none) */
  lastRepeatOf: number;
}

export class ScanState {
  header: string[] = [];
  meta: CsvMeta | null = null;
  cols: ColumnScan[] = [];
  /** header index of each plan column name (first occurrence) */
  index = new Map<string, number>();
  duplicateHeaders: { name: string; positions: number[] }[] = [];
  blankHeaders: number[] = [];
  t: Thresholds;
  rowsTotal = 0;
  rowsComplete = 0;
  ragged: RowSample;
  raggedWidths = new Map<number, number>();
  duplicateRows: RowSample;
  duplicateOf: [number, number][] = [];
  /** @internal (scan-merge.ts) */
  rowSet = new HashSet64(DUPLICATE_CAP);
  keys = new Map<number, ScanKey>();
  /** line of the earlier equal row of the row just read (0: none) */
  lastRepeatOf = 0;
  protected keyList: number[] = [];
  /** the hash of the row (or key) just read */
  protected readonly hash = new Hash64();
  predictors: Predictor[];
  design: Design;
  /** @internal (scan-merge.ts) */
  encoder: RowEncoder;
  ls: LeastSquares;
  response: ModelColumn | null = null;
  model: ModelColumn[] = [];
  /** the model's columns (response first) as scans, with each one's predictor index (−1: the response) and whether it is a category */
  protected modelCols: ColumnScan[] = [];
  protected modelPred = new Int32Array(0);
  protected modelCat = new Uint8Array(0);
  /** @internal (scan-merge.ts) */
  levelIndex: Map<string, number>[] = [];
  protected vals: Float64Array;
  /** missingness patterns over the model columns (response then predictors) as masks, "1" = missing */
  patterns = new Map<string, number>();
  /** patterns as bit masks while counting (model columns ≤ 30), turned into strings by patternMasks() */
  protected bitPatterns = new Map<number, number>();
  /** more distinct patterns than patternLimit(model columns): none kept (state.ts) */
  patternsOverflowed = false;
  protected patternCap = 1;
  /** a row's mask as bytes ("0"/"1") over more than 30 model columns, decoded once per incomplete row */
  protected maskBytes = new Uint8Array(0);
  soleUnusable: number[] = [];
  responseMissing: RowSample;
  pm: PatternMoments | null = null;
  protected pmScans: ColumnScan[] = [];
  protected pmVals = new Float64Array(0);
  unknownLevels: Map<string, RowSample>[] = [];
  /** size of the whole input in bytes when known: the hash tables are sized from it at the first lines */
  expectedBytes = 0;
  ready = false;

  constructor(readonly plan: Plan) {
    this.t = thresholdsOf(plan);
    const cap = this.t.sampleRows;
    this.ragged = new RowSample(cap);
    this.duplicateRows = new RowSample(cap);
    this.responseMissing = new RowSample(cap);
    this.predictors = predictorsOf(plan);
    this.design = buildDesign(plan, this.predictors, true);
    this.encoder = new RowEncoder(plan, this.predictors, this.design, true);
    this.ls = new LeastSquares(Math.max(1, this.design.columns.length));
    this.vals = new Float64Array(this.predictors.length);
  }

  onHeader(fields: string[], meta: CsvMeta): void {
    this.header = fields;
    this.meta = meta;
    const seen = new Map<string, number[]>();
    fields.forEach((raw, i) => {
      const name = raw.trim();
      if (name === "") this.blankHeaders.push(i);
      else {
        const l = seen.get(name);
        if (l) l.push(i);
        else seen.set(name, [i]);
      }
    });
    for (const [name, positions] of seen)
      if (positions.length > 1) this.duplicateHeaders.push({ name, positions });
    const planByName = new Map(this.plan.columns.map((c) => [c.name, c]));
    const quantCap = Math.max(
      1000,
      Math.min(QUANTILE_COLUMN_CAP, Math.floor(QUANTILE_BUDGET / Math.max(1, fields.length))),
    );
    this.cols = fields.map((raw, i) => {
      const name = raw.trim();
      const first = seen.get(name)?.[0] === i;
      const pc = first ? (planByName.get(name) ?? null) : null;
      if (first && pc) this.index.set(name, i);
      return new ColumnScan(name, pc, this.plan.missingTokens, this.t.sampleRows, quantCap);
    });
    for (const c of this.plan.columns) {
      if (c.role === "key") {
        const i = this.index.get(c.name);
        if (i !== undefined)
          this.keys.set(i, {
            set: new HashSet64(DUPLICATE_CAP),
            dup: new RowSample(this.t.sampleRows),
            examples: new Map(),
            lastRepeatOf: 0,
          });
      }
    }
    this.keyList = [...this.keys.keys()];
    const resp = this.plan.columns.find((c) => c.role === "response");
    if (resp) this.response = { name: resp.name, index: this.index.get(resp.name) ?? -1 };
    this.model = [
      ...(this.response ? [this.response] : []),
      ...this.predictors.map((p) => ({ name: p.name, index: this.index.get(p.name) ?? -1 })),
    ];
    this.modelCols = this.model.map((m) => this.cols[m.index]!);
    this.modelPred = Int32Array.from(this.model, (_, m) => (this.response ? m - 1 : m));
    this.modelCat = Uint8Array.from(this.model, (_, m) =>
      this.predictors[this.modelPred[m]!]?.kind === "category" ? 1 : 0,
    );
    this.levelIndex = this.predictors.map((p) => new Map(p.levels.map((l, j) => [l, j])));
    this.unknownLevels = this.predictors.map(() => new Map());
    this.soleUnusable = this.model.map(() => 0);
    this.patternCap = patternLimit(this.model.length);
    this.maskBytes = new Uint8Array(this.model.length);
    const numericModel = this.model.filter((m) => {
      const c = planByName.get(m.name)!;
      return m.index >= 0 && (c.type === "number" || c.type === "integer");
    });
    if (numericModel.length >= 1) {
      this.pmScans = numericModel.map((m) => this.cols[m.index]!);
      this.pm = new PatternMoments(numericModel.map((m) => m.name));
      this.pmVals = new Float64Array(numericModel.length);
    }
    this.ready = this.model.every((m) => m.index >= 0) && this.response !== null;
  }

  /** Count a row's pattern (a key of `map`) unless the distinct patterns would pass the cap. */
  protected countPattern<K>(map: Map<K, number>, key: K): void {
    const c = map.get(key);
    if (c !== undefined) map.set(key, c + 1);
    else if (this.patterns.size + this.bitPatterns.size < this.patternCap) map.set(key, 1);
    else this.overflowPatterns();
  }

  /** Drop the patterns: there are more distinct ones than the cap. */
  protected overflowPatterns(): void {
    this.patternsOverflowed = true;
    this.patterns.clear();
    this.bitPatterns.clear();
  }

  /**
   * @internal (scan-merge.ts) Add a later part's patterns: a part past the cap, or parts past it
   * together, are past it in one pass too.
   */
  absorbPatterns(masks: [string, number][], overflowed: boolean): void {
    if (overflowed) this.overflowPatterns();
    if (this.patternsOverflowed) return;
    for (const [m, c] of masks) this.patterns.set(m, (this.patterns.get(m) ?? 0) + c);
    if (this.patterns.size + this.bitPatterns.size > this.patternCap) this.overflowPatterns();
  }

  /** Missingness patterns over the model columns as strings ("1" = missing), with counts. */
  patternMasks(): [string, number][] {
    const n = this.model.length;
    const out: [string, number][] = [...this.patterns.entries()];
    for (const [bits, count] of this.bitPatterns) {
      let s = "";
      for (let m = 0; m < n; m++) s += bits & (1 << m) ? "1" : "0";
      out.push([s, count]);
    }
    return out;
  }

  /** A new level of an open-list category: add its indicator (and interaction) columns. */
  protected addLevel(i: number, level: string): number {
    const p = this.predictors[i]!;
    const from = this.design.columns;
    if (p.levels.length >= MAX_OPEN_LEVELS || from.length >= MAX_DESIGN_COLUMNS) return -1;
    p.levels.push(level);
    this.levelIndex[i]!.set(level, p.levels.length - 1);
    this.design = buildDesign(this.plan, this.predictors, true);
    if (this.design.columns.length !== from.length)
      this.ls = this.ls.expandColumns(from, this.design.columns);
    this.encoder = new RowEncoder(this.plan, this.predictors, this.design, true);
    return p.levels.length - 1;
  }

  /** The design index of the current level of category predictor pi (−1: not usable), noted on the level's entry. */
  protected levelOf(pi: number, c: ColumnScan, line: number): number {
    const acc = c.lastLevel;
    if (acc && acc.design !== undefined && acc.design >= 0) return acc.design;
    const s = c.str;
    let li = this.levelIndex[pi]!.get(s) ?? -1;
    if (li < 0 && this.predictors[pi]!.open) li = this.addLevel(pi, s);
    if (li < 0) {
      let u = this.unknownLevels[pi]!.get(s);
      if (!u && this.unknownLevels[pi]!.size < 1000)
        this.unknownLevels[pi]!.set(s, (u = new RowSample(this.t.sampleRows)));
      u?.add(line);
    }
    if (acc) acc.design = li;
    return li;
  }
}
