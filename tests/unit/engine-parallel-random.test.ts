/**
 * Parallel against single: random batch files whose quoted fields hold line breaks, so that the
 * guessed starts of the byte ranges often fall inside a record, are checked by checkFile split
 * into 2–4 ranges and by one pass (checkBatch); the reports are the same in every field —
 * findings, row numbers, counts, the fit — up to floating-point merge order (1e-9 relative).
 * The ranges are read in this thread (the same reading, splitting and merging as the worker
 * threads, which the last test uses).
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, test } from "vitest";
import { checkBatch, type ReadinessReport } from "@/lib/readiness";
import { checkFile } from "@/lib/readiness/node";
import { csvRecords } from "@/lib/readiness/records";
import { countLines, survey } from "@/lib/readiness/split";
import { HEADER, chunks, cleanRows, csvOf, plan, rng, type Row } from "../fixtures/engine/data";
import { close } from "../helpers/close";

// every field but the merge state and the run's timings: the examples of keys repeated across
// ranges included (counted again after the merge, lib/readiness/key-examples.ts)
const strip = ({ state: _s, timings: _t, ...rest }: ReadinessReport) => rest;

const P = plan();

function randomBatch(seed: number): string {
  const r = rng(seed);
  const rows: Row[] = cleanRows(200 + Math.floor(r() * 600), seed);
  const col = (name: string) => HEADER.indexOf(name);
  for (const row of rows) {
    const u = r();
    if (u < 0.3)
      row[col("farm")] = `"north ${Math.floor(r() * 9)},\n""upper""${r() < 0.5 ? "\r\n" : "\n\n"}field"`;
    else if (u < 0.33) row[col("nitrogen")] = "";
    else if (u < 0.34) row[col("nitrogen")] = "n/a";
    else if (u < 0.35) row[col("soil")] = "Clay";
    else if (u < 0.355) row[col("yield")] = "";
  }
  for (let k = 0; k < 3; k++) rows[Math.floor(r() * rows.length)] = [...rows[Math.floor(r() * rows.length)]!];
  // keys repeated in other rows, often in another range, now and then more than ten of them
  const repeats = Math.floor(r() * 16);
  for (let k = 0; k < repeats; k++) {
    const key = rows[Math.floor(r() * rows.length)]![col("plot_id")]!;
    rows[Math.floor(r() * rows.length)]![col("plot_id")] = r() < 0.2 ? `"${key}"` : key;
  }
  if (r() < 0.3) rows.splice(Math.floor(r() * rows.length), 0, [1, 2, 3]);
  const header = r() < 0.5 ? HEADER.map((h) => `"${h}"`) : HEADER;
  return csvOf(header, rows, ",", r() < 0.3 ? "\r\n" : "\n");
}

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tributary-parrand-"));

describe("checkFile over byte ranges equals one pass", () => {
  test("300 random files, 2–4 ranges, range starts guessed inside quoted fields", async () => {
    let inside = 0;
    for (let i = 0; i < 300; i++) {
      const text = randomBatch(500 + i);
      const file = path.join(dir, `b${i}.csv`);
      fs.writeFileSync(file, text);
      const one = await checkBatch(chunks(text, 1 << 16), P);
      const par = await checkFile(file, P, { minBytes: 0, workers: 2 + (i % 3), inThread: true });
      close(strip(one), strip(par), `file ${i}`);
      // how often a guessed range start is not the start of a record (the range is read again)
      const starts = new Set<number>();
      for await (const rec of csvRecords(chunks(text, 1 << 16))) starts.add(rec.line);
      if (survey(file, text.length, 2 + (i % 3))!.starts.some((g) => !starts.has(g.firstLine))) inside++;
    }
    expect(inside).toBeGreaterThan(50);
  }, 300_000);

  test("with worker threads", async () => {
    for (let i = 0; i < 3; i++) {
      const text = randomBatch(9000 + i);
      const file = path.join(dir, `w${i}.csv`);
      fs.writeFileSync(file, text);
      const one = await checkBatch(chunks(text, 1 << 16), P);
      const par = await checkFile(file, P, {
        minBytes: 0,
        workers: 3,
        workerScript: path.resolve("tests/fixtures/engine/range-worker.ts"),
      });
      close(strip(one), strip(par), `file ${i}`);
    }
  }, 120_000);
});

describe("counting the line breaks before a range (the survey's line numbers)", () => {
  test("LF, CR and CRLF each once, across block boundaries, on 400 random byte runs", () => {
    const r = rng(77);
    const file = path.join(dir, "breaks.bin");
    for (let i = 0; i < 400; i++) {
      const alphabet = i % 4 === 0 ? "ab\n" : "ab\n\r";
      let text = "";
      for (let n = Math.floor(r() * 3000); n > 0; n--) text += alphabet[Math.floor(r() * alphabet.length)];
      fs.writeFileSync(file, text);
      const from = Math.floor(r() * (text.length + 1));
      const to = from + Math.floor(r() * (text.length - from + 1));
      // the same rule as the tokenizer's: CRLF is one break, a lone CR or LF is one
      const want = (text.slice(from, to).match(/\r\n|\r|\n/g) ?? []).length;
      const fd = fs.openSync(file, "r");
      try {
        for (const block of [4, 8, 12, 64, 1 << 20])
          expect(countLines(fd, from, to, block), `${i}/${block}`).toBe(want);
      } finally {
        fs.closeSync(fd);
      }
    }
  });
});
