/**
 * Reading a batch file at the consumer's pace: the one reader of ./csv-reader.ts, paused
 * between byte chunks while the items it produced are not yet taken (the pool export, rows at
 * fault). Each record carries the line it starts on, as the readiness report numbers rows.
 */
import { bytesOf, readCsv, type ByteInput, type ReadOptions } from "./csv-reader";

export interface CsvRecord {
  kind: "header" | "row";
  /** the line on which the record starts (header = 1) */
  line: number;
  fields: string[];
}

/**
 * Run `read` over the bytes of `input` and yield what it puts into `holder.out`, in order;
 * reading waits while `highWater` items or more are waiting. Rethrows the reader's error
 * after the items produced before it.
 */
export async function* pulled<T>(
  input: ByteInput,
  holder: { out: T[] },
  read: (bytes: AsyncIterable<Uint8Array>) => Promise<unknown>,
  highWater = 1,
): AsyncGenerator<T, void, undefined> {
  let done = false;
  let failure: unknown = null;
  let cancelled = false;
  let wake: (() => void) | null = null;
  let resume: (() => void) | null = null;
  const signal = () => {
    const w = wake;
    wake = null;
    w?.();
  };
  const release = () => {
    const r = resume as (() => void) | null;
    resume = null;
    r?.();
  };
  async function* gated(): AsyncGenerator<Uint8Array> {
    for await (const chunk of bytesOf(input)) {
      if (cancelled) return;
      if (holder.out.length >= highWater) {
        signal();
        await new Promise<void>((r) => (resume = r));
        if (cancelled) return;
      }
      yield chunk;
      signal();
    }
  }
  const reading = read(gated()).then(
    () => {
      done = true;
      signal();
    },
    (e: unknown) => {
      failure = e;
      done = true;
      signal();
    },
  );
  try {
    for (;;) {
      if (holder.out.length > 0) {
        const batch = holder.out;
        holder.out = [];
        for (const item of batch) yield item;
        continue;
      }
      if (done) break;
      release();
      await new Promise<void>((r) => {
        wake = r;
        if (done || holder.out.length > 0) signal();
      });
    }
    if (failure) throw failure;
  } finally {
    cancelled = true;
    release();
    await reading;
  }
}

/** The header record first, then every data record in file order (blank lines skipped). */
export function csvRecords(
  input: ByteInput,
  opts: Omit<ReadOptions, "range"> = {},
): AsyncGenerator<CsvRecord, void, undefined> {
  const holder: { out: CsvRecord[] } = { out: [] };
  const sink = {
    onHeader: (fields: string[]) => holder.out.push({ kind: "header", line: 1, fields }),
    onRecords: (rows: string[][], lines: number[]) => {
      for (let i = 0; i < rows.length; i++)
        holder.out.push({ kind: "row", line: lines[i]!, fields: rows[i]! });
    },
  };
  return pulled(input, holder, (bytes) => readCsv(bytes, sink, opts));
}
