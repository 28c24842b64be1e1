/**
 * The single streaming pass: header checks, per-column accumulators, the design rows of the
 * complete cases into the least-squares factor, missingness patterns, duplicate rows and keys.
 */
import { RowSample } from "./accumulators";
import { HASH, HashSet64, hashByteFields, hashFields } from "./hashing";
import { ColumnScan, FieldStatus } from "./column-scan";
import type { CsvMeta, CsvSink } from "./csv-reader";
import type { FieldBatch } from "./tokenizer";
import { RowEncoder, buildDesign, predictorsOf, type Design, type Predictor } from "./design";
import { thresholdsOf, type Plan, type Thresholds } from "./plan";
import { LeastSquares, PatternMoments } from "./stats";

/** total values kept for exact quartiles across all columns (8 bytes each) */
export const QUANTILE_BUDGET = 4_000_000;
/** per-column bound of exact quartiles; beyond it a reservoir sample of this size */
export const QUANTILE_COLUMN_CAP = 200_000;
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

export class Scan implements CsvSink {
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
  keys = new Map<number, { set: HashSet64; dup: RowSample; examples: Map<string, number>; lastRepeatOf: number }>();
  /** line of the earlier equal row of the row just read (0: none) */
  lastRepeatOf = 0;
  private keyList: number[] = [];
  private keyHash = new Float64Array(0);
  predictors: Predictor[];
  design: Design;
  /** @internal (scan-merge.ts) */
  encoder: RowEncoder;
  ls: LeastSquares;
  response: ModelColumn | null = null;
  model: ModelColumn[] = [];
  /** the model's columns (response first) as scans, with each one's predictor index (−1: the response) and whether it is a category */
  private modelCols: ColumnScan[] = [];
  private modelPred = new Int32Array(0);
  private modelCat = new Uint8Array(0);
  /** @internal (scan-merge.ts) */
  levelIndex: Map<string, number>[] = [];
  private vals: Float64Array;
  /** model columns used in the missingness patterns: response then predictors */
  patterns = new Map<string, number>();
  /** patterns as bit masks while counting (model columns ≤ 30), turned into strings by patternMasks() */
  private bitPatterns = new Map<number, number>();
  soleUnusable: number[] = [];
  responseMissing: RowSample;
  pm: PatternMoments | null = null;
  private pmScans: ColumnScan[] = [];
  private pmVals = new Float64Array(0);
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
    for (const [name, positions] of seen) if (positions.length > 1) this.duplicateHeaders.push({ name, positions });
    const planByName = new Map(this.plan.columns.map((c) => [c.name, c]));
    const quantCap = Math.max(1000, Math.min(QUANTILE_COLUMN_CAP, Math.floor(QUANTILE_BUDGET / Math.max(1, fields.length))));
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
        if (i !== undefined) this.keys.set(i, { set: new HashSet64(DUPLICATE_CAP), dup: new RowSample(this.t.sampleRows), examples: new Map(), lastRepeatOf: 0 });
      }
    }
    this.keyList = [...this.keys.keys()];
    this.keyHash = new Float64Array(2 * this.keyList.length);
    const resp = this.plan.columns.find((c) => c.role === "response");
    if (resp) this.response = { name: resp.name, index: this.index.get(resp.name) ?? -1 };
    this.model = [...(this.response ? [this.response] : []), ...this.predictors.map((p) => ({ name: p.name, index: this.index.get(p.name) ?? -1 }))];
    this.modelCols = this.model.map((m) => this.cols[m.index]!);
    this.modelPred = Int32Array.from(this.model, (_, m) => (this.response ? m - 1 : m));
    this.modelCat = Uint8Array.from(this.model, (_, m) => (this.predictors[this.modelPred[m]!]?.kind === "category" ? 1 : 0));
    this.levelIndex = this.predictors.map((p) => new Map(p.levels.map((l, j) => [l, j])));
    this.unknownLevels = this.predictors.map(() => new Map());
    this.soleUnusable = this.model.map(() => 0);
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
  private addLevel(i: number, level: string): number {
    const p = this.predictors[i]!;
    const from = this.design.columns;
    if (p.levels.length >= MAX_OPEN_LEVELS || from.length >= MAX_DESIGN_COLUMNS) return -1;
    p.levels.push(level);
    this.levelIndex[i]!.set(level, p.levels.length - 1);
    this.design = buildDesign(this.plan, this.predictors, true);
    if (this.design.columns.length !== from.length) this.ls = this.ls.expandColumns(from, this.design.columns);
    this.encoder = new RowEncoder(this.plan, this.predictors, this.design, true);
    return p.levels.length - 1;
  }

  onRecords(rows: string[][], lines: number[]): void {
    const cols = this.cols;
    const ncol = cols.length;
    for (let r = 0; r < rows.length; r++) {
      const f = rows[r]!;
      const line = lines[r]!;
      if (f.length !== ncol) {
        this.raggedRow(line, f.length);
        continue;
      }
      this.rowsTotal++;
      for (let j = 0; j < ncol; j++) cols[j]!.read(f[j]!, line);
      for (let q = 0; q < this.keyList.length; q++) {
        hashFields(f, this.keyList[q]!, this.keyList[q]! + 1);
        this.keyHash[2 * q] = HASH.a;
        this.keyHash[2 * q + 1] = HASH.b;
      }
      hashFields(f);
      this.finishRow(line);
    }
  }

  private raggedRow(line: number, width: number): void {
    this.ragged.add(line);
    this.raggedWidths.set(width, (this.raggedWidths.get(width) ?? 0) + 1);
  }

  /** A block of records as byte spans (the tokenizer's): the hot path. */
  onBatch(bt: FieldBatch): void {
    const cols = this.cols;
    const ncol = cols.length;
    const { buf, starts, ends, recs, lines } = bt;
    if (this.expectedBytes > 0 && bt.count - bt.first > 100) {
      // size the duplicate tables once: about as many rows as bytes / bytes per record here
      const span = ends[recs[bt.count]! - 1]! - starts[recs[bt.first]!]!;
      const rows = (this.expectedBytes / Math.max(1, span / (bt.count - bt.first))) * 1.05;
      this.rowSet.reserve(rows);
      for (const k of this.keys.values()) k.set.reserve(rows);
      this.expectedBytes = 0;
    }
    for (let r = bt.first; r < bt.count; r++) {
      const f0 = recs[r]!;
      const line = lines[r]!;
      const width = recs[r + 1]! - f0;
      if (width !== ncol) {
        this.raggedRow(line, width);
        continue;
      }
      this.rowsTotal++;
      for (let k = 0; k < ncol; k++) cols[k]!.readBytes(buf, starts[f0 + k]!, ends[f0 + k]!, line);
      for (let q = 0; q < this.keyList.length; q++) {
        const k = f0 + this.keyList[q]!;
        hashByteFields(buf, starts, ends, k, k + 1);
        this.keyHash[2 * q] = HASH.a;
        this.keyHash[2 * q + 1] = HASH.b;
      }
      hashByteFields(buf, starts, ends, f0, f0 + ncol);
      this.finishRow(line);
    }
  }

  /** After the columns of one row were read and HASH holds the row's hash (keys' in keyHash). */
  private finishRow(line: number): void {
    const cols = this.cols;
    {
      const prev = this.rowSet.addOrGet(HASH.a, HASH.b, line);
      this.lastRepeatOf = prev;
      if (prev) {
        this.duplicateRows.add(line);
        if (this.duplicateOf.length < this.t.sampleRows) this.duplicateOf.push([line, prev]);
      }
      for (let q = 0; q < this.keyList.length; q++) {
        const k = this.keyList[q]!;
        const c = cols[k]!;
        if (c.status !== FieldStatus.Usable) continue;
        const key = this.keys.get(k)!;
        const first = key.set.addOrGet(this.keyHash[2 * q]!, this.keyHash[2 * q + 1]!, line);
        key.lastRepeatOf = first;
        if (first) {
          key.dup.add(line);
          const v = c.str || String(c.value);
          if (key.examples.size < 10 || key.examples.has(v)) key.examples.set(v, (key.examples.get(v) ?? 1) + 1);
        }
      }
      if (!this.ready) return;
      this.modelRow(line);
    }
  }

  /** The planned model's share of a row: complete cases, missingness patterns, least squares. */
  private modelRow(line: number): void {
    const mc = this.modelCols;
    const nModel = mc.length;
    const vals = this.vals;
    let unusable = 0;
    let sole = -1;
    let mask = "";
    let bits = 0;
    const useBits = nModel <= 30;
    for (let m = 0; m < nModel; m++) {
      const c = mc[m]!;
      const status = c.status;
      let ok = status === FieldStatus.Usable;
      const pi = this.modelPred[m]!;
      if (pi >= 0) {
        if (ok && this.modelCat[m] === 1) {
          const li = this.levelOf(pi, c, line);
          if (li < 0) ok = false;
          vals[pi] = li;
        } else vals[pi] = c.value;
      }
      if (status === FieldStatus.Missing) {
        if (useBits) bits |= 1 << m;
        else mask += "1";
      } else if (!useBits) mask += "0";
      if (!ok) {
        unusable++;
        sole = m;
      }
    }
    if (this.response && mc[0]!.status === FieldStatus.Missing) this.responseMissing.add(line);
    if (useBits) {
      if (bits !== 0) this.bitPatterns.set(bits, (this.bitPatterns.get(bits) ?? 0) + 1);
    } else if (mask.indexOf("1") >= 0) this.patterns.set(mask, (this.patterns.get(mask) ?? 0) + 1);
    if (this.pm) {
      const pv = this.pmVals;
      let observed = 0;
      for (let q = 0; q < this.pmScans.length; q++) {
        const c = this.pmScans[q]!;
        if (c.status === FieldStatus.Usable) {
          pv[q] = c.value;
          observed |= 1 << q;
        }
      }
      if (this.pmScans.length <= 30) this.pm.addMasked(pv, observed);
      else this.pm.addRow(this.pmScans.map((c) => (c.status === FieldStatus.Usable ? c.value : null)));
    }
    if (unusable === 1) this.soleUnusable[sole]!++;
    if (unusable > 0) return;
    this.rowsComplete++;
    for (let m = 0; m < nModel; m++) {
      if (this.modelCat[m] === 1) {
        const acc = mc[m]!.lastLevel;
        if (acc) acc.complete++;
      }
    }
    const y = this.response ? mc[0]!.value : 0;
    this.ls.addRow(this.encoder.encode(vals), y);
  }

  /** The design index of the current level of category predictor pi (−1: not usable), noted on the level's entry. */
  private levelOf(pi: number, c: ColumnScan, line: number): number {
    const acc = c.lastLevel;
    if (acc && acc.design !== undefined && acc.design >= 0) return acc.design;
    const s = c.str;
    let li = this.levelIndex[pi]!.get(s) ?? -1;
    if (li < 0 && this.predictors[pi]!.open) li = this.addLevel(pi, s);
    if (li < 0) {
      let u = this.unknownLevels[pi]!.get(s);
      if (!u && this.unknownLevels[pi]!.size < 1000) this.unknownLevels[pi]!.set(s, (u = new RowSample(this.t.sampleRows)));
      u?.add(line);
    }
    if (acc) acc.design = li;
    return li;
  }
}
