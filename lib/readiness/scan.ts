/**
 * The single streaming pass: each record's fields into the column scans, the row's and keys'
 * hashes into the duplicate tables, and the complete cases' design rows into the
 * least-squares factor (the state is ./scan-state.ts).
 */
import { FieldStatus } from "./column-scan";
import type { CsvSink } from "./csv-reader";
import { BlockText, type FieldBatch } from "./fields";
import { hashByteFields, hashFields } from "./hashing";
import { addKeyExample, keyExampleText } from "./key-examples";
import { ScanState, type ScanKey } from "./scan-state";

const latin1 = new TextDecoder("latin1");

export {
  DUPLICATE_CAP,
  MAX_DESIGN_COLUMNS,
  MAX_OPEN_LEVELS,
  QUANTILE_BUDGET,
  QUANTILE_COLUMN_CAP,
  type ModelColumn,
} from "./scan-state";

/**
 * One block's row and key hashes (and what a repeated key's example needs), kept from the
 * reading of its rows until its lookups in the duplicate tables (Scan.onBatch).
 */
class BlockHashes {
  rows = 0;
  keys = 0;
  rowA = new Uint32Array(0);
  rowB = new Uint32Array(0);
  lines = new Int32Array(0);
  /** each row's first field in the block */
  f0 = new Int32Array(0);
  /** key q of row i at q * rows + i: its hash halves, whether it was usable, its number */
  keyA = new Uint32Array(0);
  keyB = new Uint32Array(0);
  keyUsable = new Uint8Array(0);
  keyValue = new Float64Array(0);

  fit(rows: number, keys: number): void {
    if (rows <= this.rows && keys === this.keys) return;
    this.rows = Math.max(rows, this.rows);
    this.keys = keys;
    this.rowA = new Uint32Array(this.rows);
    this.rowB = new Uint32Array(this.rows);
    this.lines = new Int32Array(this.rows);
    this.f0 = new Int32Array(this.rows);
    this.keyA = new Uint32Array(this.rows * keys);
    this.keyB = new Uint32Array(this.rows * keys);
    this.keyUsable = new Uint8Array(this.rows * keys);
    this.keyValue = new Float64Array(this.rows * keys);
  }
}

export class Scan extends ScanState implements CsvSink {
  private readonly blockText = new BlockText();
  private readonly block = new BlockHashes();

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
      hashFields(this.hash, f);
      this.rowRepeat(this.hash.a, this.hash.b, line);
      for (let q = 0; q < this.keyList.length; q++) {
        const k = this.keyList[q]!;
        const c = cols[k]!;
        if (c.status !== FieldStatus.Usable) continue;
        hashFields(this.hash, f, k, k + 1);
        const key = this.keys.get(k)!;
        if (this.keyRepeat(key, this.hash.a, this.hash.b, line))
          addKeyExample(key.examples, keyExampleText(c.kind, c.value, f[k]!));
      }
      if (this.ready) this.modelRow(line);
    }
  }

  private raggedRow(line: number, width: number): void {
    this.ragged.add(line);
    this.raggedWidths.set(width, (this.raggedWidths.get(width) ?? 0) + 1);
  }

  /**
   * A block of records as byte spans (the tokenizer's): the hot path. Each row's fields are read
   * and its hashes kept; then the block's rows are looked up in the row table, and then in each
   * key's, one after another: in file order as before, and the lookups, which mostly miss the
   * processor's caches in a large table, no longer wait on each other.
   */
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
    const keyList = this.keyList;
    const nk = keyList.length;
    const h = this.block;
    h.fit(bt.count - bt.first, nk);
    const stride = h.rows;
    let n = 0;
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
      hashByteFields(this.hash, buf, starts, ends, f0, f0 + ncol);
      h.rowA[n] = this.hash.a;
      h.rowB[n] = this.hash.b;
      h.lines[n] = line;
      h.f0[n] = f0;
      for (let q = 0; q < nk; q++) {
        const k = keyList[q]!;
        const c = cols[k]!;
        const at = q * stride + n;
        h.keyUsable[at] = c.status === FieldStatus.Usable ? 1 : 0;
        h.keyValue[at] = c.value;
        hashByteFields(this.hash, buf, starts, ends, f0 + k, f0 + k + 1);
        h.keyA[at] = this.hash.a;
        h.keyB[at] = this.hash.b;
      }
      if (this.ready) this.modelRow(line);
      n++;
    }
    for (let i = 0; i < n; i++) this.rowRepeat(h.rowA[i]!, h.rowB[i]!, h.lines[i]!);
    for (let q = 0; q < nk; q++) {
      const k = keyList[q]!;
      const key = this.keys.get(k)!;
      const kind = cols[k]!.kind;
      for (let i = 0; i < n; i++) {
        const at = q * stride + i;
        if (h.keyUsable[at] !== 1 || !this.keyRepeat(key, h.keyA[at]!, h.keyB[at]!, h.lines[i]!)) continue;
        const f = h.f0[i]! + k;
        addKeyExample(key.examples, keyExampleText(kind, h.keyValue[at]!, text.get(starts[f]!, ends[f]!)));
      }
    }
  }

  /** The row with hash (a, b) on `line`: a repeat of an earlier row, or a new one. */
  private rowRepeat(a: number, b: number, line: number): void {
    const prev = this.rowSet.addOrGet(a, b, line);
    this.lastRepeatOf = prev;
    if (prev) {
      this.duplicateRows.add(line);
      if (this.duplicateOf.length < this.t.sampleRows) this.duplicateOf.push([line, prev]);
    }
  }

  /** A usable key with hash (a, b) on `line`; true when an earlier row has it. */
  private keyRepeat(key: ScanKey, a: number, b: number, line: number): boolean {
    const first = key.set.addOrGet(a, b, line);
    key.lastRepeatOf = first;
    if (first) key.dup.add(line);
    return first !== 0;
  }

  /** The planned model's share of a row: complete cases, missingness patterns, least squares. */
  private modelRow(line: number): void {
    const mc = this.modelCols;
    const nModel = mc.length;
    const vals = this.vals;
    let unusable = 0;
    let sole = -1;
    let missing = false;
    let bits = 0;
    const useBits = nModel <= 30;
    const maskBytes = this.maskBytes;
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
        missing = true;
        if (useBits) bits |= 1 << m;
        else maskBytes[m] = 49; // "1"
      } else if (!useBits) maskBytes[m] = 48; // "0"
      if (!ok) {
        unusable++;
        sole = m;
      }
    }
    if (this.response && mc[0]!.status === FieldStatus.Missing) this.responseMissing.add(line);
    if (missing && !this.patternsOverflowed) {
      if (useBits) this.countPattern(this.bitPatterns, bits);
      else this.countPattern(this.patterns, latin1.decode(maskBytes));
    }
    if (this.pm && !this.pm.overflowed) {
      const pv = this.pmVals;
      let observed = 0;
      for (let q = 0; q < this.pmScans.length; q++) {
        const c = this.pmScans[q]!;
        if (c.status === FieldStatus.Usable) {
          pv[q] = c.value;
          observed |= 1 << q;
        } else pv[q] = NaN; // missing for addRow; addMasked reads only the observed
      }
      if (this.pmScans.length <= 30) this.pm.addMasked(pv, observed);
      else this.pm.addRow(pv);
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
