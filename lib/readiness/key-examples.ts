/**
 * The examples of a repeated key (`key.duplicate`: up to ten repeated values and how often each
 * occurs) when a file was read in byte ranges. A range's own examples see only the repeats
 * inside it, and a repeat of a key first seen in an earlier range reaches the merge as a hash
 * without its value. So, once the ranges are merged, the examples are counted again exactly as
 * one pass counts them: the first range's examples stand (it starts at the file's start), and
 * each later range is read once more, its key columns only, asking the merged key set whether a
 * row's key first occurred on an earlier line. Only a file whose later ranges hold a repeated
 * key pays for it, one more read of those ranges' bytes.
 */
import { FieldStatus, ColumnScan } from "./column-scan";
import type { CsvMeta, CsvSink } from "./csv-reader";
import { BlockText, type FieldBatch } from "./fields";
import { Hash64, hashByteFields, hashFields } from "./hashing";
import type { Scan } from "./scan";

/** The example rule of one pass (scan.ts): the first ten repeated values, each counted to its occurrences. */
export function addKeyExample(examples: Map<string, number>, value: string): void {
  if (examples.size < 10 || examples.has(value)) examples.set(value, (examples.get(value) ?? 1) + 1);
}

/** A repeated key's example: a number as the engine read it, any other value as the file has it. */
export function keyExampleText(kind: ColumnScan["kind"], value: number, field: string): string {
  return kind === "number" || kind === "integer" || kind === "boolean" ? String(value) : field;
}

/** A sink that counts a later range's repeated keys into the merged scan's examples (in file order). */
export class KeyExampleRecount implements CsvSink {
  private readonly hash = new Hash64();
  private readonly text = new BlockText();
  private cols: { at: number; col: ColumnScan }[] = [];
  private width = 0;

  /** `keys`: the header positions of the key columns to count (each a planned key of `scan`) */
  constructor(
    private readonly scan: Scan,
    private readonly keys: Set<number>,
  ) {}

  onHeader(fields: string[], _meta: CsvMeta): void {
    this.width = fields.length;
    const plan = this.scan.plan;
    this.cols = [...this.keys].map((at) => ({
      at,
      col: new ColumnScan(
        fields[at]!.trim(),
        plan.columns.find((c) => c.name === fields[at]!.trim()) ?? null,
        plan.missingTokens,
        1,
        1000,
      ),
    }));
  }

  private repeat(at: number, col: ColumnScan, line: number, field: () => string): void {
    if (col.status !== FieldStatus.Usable) return;
    const key = this.scan.keys.get(at)!;
    const first = key.set.lineOf(this.hash.a, this.hash.b);
    if (first > 0 && first < line) addKeyExample(key.examples, keyExampleText(col.kind, col.value, field()));
  }

  onBatch(bt: FieldBatch): void {
    const { buf, starts, ends, recs, lines } = bt;
    if (bt.count > bt.first) this.text.reset(buf, starts[recs[bt.first]!]!, ends[recs[bt.count]! - 1]!);
    for (let r = bt.first; r < bt.count; r++) {
      const f0 = recs[r]!;
      if (recs[r + 1]! - f0 !== this.width) continue;
      for (const { at, col } of this.cols) {
        const f = f0 + at;
        col.readBytes(buf, starts[f]!, ends[f]!, lines[r]!, this.text);
        hashByteFields(this.hash, buf, starts, ends, f, f + 1);
        this.repeat(at, col, lines[r]!, () => this.text.get(starts[f]!, ends[f]!));
      }
    }
  }

  onRecords(rows: string[][], lines: number[]): void {
    for (let r = 0; r < rows.length; r++) {
      const row = rows[r]!;
      if (row.length !== this.width) continue;
      for (const { at, col } of this.cols) {
        col.read(row[at]!, lines[r]!);
        hashFields(this.hash, row, at, at + 1);
        this.repeat(at, col, lines[r]!, () => row[at]!);
      }
    }
  }
}
