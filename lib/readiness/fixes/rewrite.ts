/**
 * The corrected file, byte-faithful: the original streamed through the one reader (with raw
 * offsets), every byte copied as it was except the raw text of the cells an applied proposal
 * changes. Quoting, spacing, line endings, blank lines, the byte-order mark and the other cells
 * stay byte for byte; a changed cell is quoted only when it must be. Every change is logged.
 * Runs in Node, in a Web Worker and in the CLI alike.
 */
import { readCsv, type ByteInput, type CsvMeta } from "../csv-reader";
import { pulled } from "../records";
import { fieldText, type FieldBatch } from "../fields";
import { fixersByColumn, type CellFix } from "./cells";
import type { FixChange, FixProposal } from "./types";

export interface ApplyOptions {
  /** the delimiter when known (the report's `file.delimiter`) */
  delimiter?: string;
  isUtf8?: (b: Uint8Array) => boolean;
}

export interface AppliedFixes {
  /** the corrected file's bytes, a chunk at a time */
  output: AsyncGenerator<Uint8Array, void, undefined>;
  /** the change log, complete once `output` is exhausted: in file order */
  changes: FixChange[];
}

const encoder = new TextEncoder();

/** A changed cell as CSV text: quoted only when the delimiter, a quote or a line break is in it. */
export function cellText(value: string, delimiter: string, onlyField: boolean): string {
  if (value === "" && onlyField) return '""'; // an empty line would drop the row
  if (/["\r\n]/.test(value) || value.includes(delimiter)) return `"${value.replace(/"/g, '""')}"`;
  return value;
}

/** Apply `proposals` to the file: the corrected bytes and the change log. */
export function applyFixes(
  input: ByteInput,
  proposals: FixProposal[],
  opts: ApplyOptions = {},
): AppliedFixes {
  const changes: FixChange[] = [];
  const holder: { out: Uint8Array[] } = { out: [] };
  const queue: { off: number; bytes: Uint8Array }[] = [];
  let total = 0;
  let pos = 0;
  let meta: CsvMeta | null = null;
  let header: string[] = [];
  let fixers: ((s: string) => CellFix | null)[] = [];
  const renames = new Map(
    proposals.flatMap((p) => (p.rule.kind === "rename" ? [[p.rule.from, p] as const] : [])),
  );

  async function* tee(src: AsyncIterable<Uint8Array>): AsyncGenerator<Uint8Array> {
    for await (const c of src) {
      queue.push({ off: total, bytes: c });
      total += c.length;
      yield c;
    }
  }

  /** Copy the original bytes up to file offset `to`. */
  const copyTo = (to: number) => {
    while (pos < to && queue.length) {
      const q = queue[0]!;
      const end = q.off + q.bytes.length;
      if (end <= pos) {
        queue.shift();
        continue;
      }
      const stop = Math.min(end, to);
      holder.out.push(q.bytes.subarray(pos - q.off, stop - q.off));
      pos = stop;
    }
  };

  const replace = (b: FieldBatch, r: number, f: number, after: string) => {
    const k = f - b.recs[r]!;
    const start = k === 0 ? b.recOffsets![r]! : b.rawEnds![f - 1]! + 1;
    copyTo(start);
    holder.out.push(encoder.encode(cellText(after, meta!.delimiter, b.recs[r + 1]! - b.recs[r]! === 1)));
    pos = b.rawEnds![f]!;
  };

  const sink = {
    onHeader(fields: string[], m: CsvMeta) {
      meta = m;
      header = fields.map((h) => h.trim());
      const by = fixersByColumn(proposals);
      fixers = header.map((h, i) => (header.indexOf(h) === i ? by.get(h) : undefined) ?? (() => null));
    },
    onBatch(b: FieldBatch) {
      if (b.first === 1) {
        // the header record: renames
        for (let f = b.recs[0]!; f < b.recs[1]!; f++) {
          const before = fieldText(b.buf, b.starts[f]!, b.ends[f]!);
          const p = renames.get(before.trim());
          if (!p || p.rule.kind !== "rename") continue;
          replace(b, 0, f, p.rule.to);
          changes.push({ row: 1, column: before.trim(), before, after: p.rule.to, proposal: p.id });
        }
      }
      for (let r = b.first; r < b.count; r++) {
        const from = b.recs[r]!;
        const to = Math.min(b.recs[r + 1]!, from + fixers.length);
        for (let f = from; f < to; f++) {
          const fix = fixers[f - from]!;
          const before = fieldText(b.buf, b.starts[f]!, b.ends[f]!);
          const done = fix(before);
          if (!done) continue;
          replace(b, r, f, done.after);
          changes.push({
            row: b.lines[r]!,
            column: header[f - from]!,
            before,
            after: done.after,
            proposal: done.proposal,
          });
        }
      }
      const last = b.recs[b.count]! - 1;
      if (last >= 0) copyTo(b.rawEnds![last]!);
    },
  };

  const read = async (bytes: AsyncIterable<Uint8Array>) => {
    await readCsv(tee(bytes), sink, { raw: true, delimiter: opts.delimiter, isUtf8: opts.isUtf8 });
    copyTo(Infinity);
  };
  return { output: pulled(input, holder, read, 64), changes };
}

async function* once(b: Uint8Array): AsyncGenerator<Uint8Array> {
  yield b;
}

/** applyFixes on bytes in memory: the corrected file and its change log. */
export async function applyFixesToBytes(
  bytes: Uint8Array,
  proposals: FixProposal[],
  opts: ApplyOptions = {},
): Promise<{ bytes: Uint8Array; changes: FixChange[] }> {
  const { output, changes } = applyFixes(once(bytes), proposals, opts);
  const parts: Uint8Array[] = [];
  let n = 0;
  for await (const c of output) {
    parts.push(c);
    n += c.length;
  }
  const out = new Uint8Array(n);
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return { bytes: out, changes };
}
