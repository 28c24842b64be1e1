/**
 * The single streaming pass: each record's fields into the column scans, the row's and keys'
 * hashes into the duplicate tables, and the complete cases' design rows into the
 * least-squares factor (the state is ./scan-state.ts).
 */
import { FieldStatus } from "./column-scan";
import type { CsvSink } from "./csv-reader";
import { BlockText, type FieldBatch } from "./fields";
import { hashByteFields, hashFields } from "./hashing";
import { addKeyExample } from "./key-examples";
import { ScanState } from "./scan-state";

export {
  DUPLICATE_CAP,
  MAX_DESIGN_COLUMNS,
  MAX_OPEN_LEVELS,
  QUANTILE_BUDGET,
  QUANTILE_COLUMN_CAP,
  type ModelColumn,
} from "./scan-state";

export class Scan extends ScanState implements CsvSink {
  private readonly blockText = new BlockText();

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
        hashFields(this.hash, f, this.keyList[q]!, this.keyList[q]! + 1);
        this.keyHash[2 * q] = this.hash.a;
        this.keyHash[2 * q + 1] = this.hash.b;
      }
      hashFields(this.hash, f);
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
    const text = this.blockText;
    if (bt.count > bt.first) text.reset(buf, starts[recs[bt.first]!]!, ends[recs[bt.count]! - 1]!);
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
      for (let k = 0; k < ncol; k++) cols[k]!.readBytes(buf, starts[f0 + k]!, ends[f0 + k]!, line, text);
      for (let q = 0; q < this.keyList.length; q++) {
        const k = f0 + this.keyList[q]!;
        hashByteFields(this.hash, buf, starts, ends, k, k + 1);
        this.keyHash[2 * q] = this.hash.a;
        this.keyHash[2 * q + 1] = this.hash.b;
      }
      hashByteFields(this.hash, buf, starts, ends, f0, f0 + ncol);
      this.finishRow(line);
    }
  }

  /** After the columns of one row were read and `hash` holds the row's hash (keys' in keyHash). */
  private finishRow(line: number): void {
    const cols = this.cols;
    {
      const prev = this.rowSet.addOrGet(this.hash.a, this.hash.b, line);
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
          addKeyExample(key.examples, c.keyText());
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
}
