/**
 * The one reader (lib/readiness/tokenizer.ts, csv-reader.ts): the five reader defects of
 * issue 15 as regression tests. Outside references: RFC 4180 (quoting), RFC 3629 §3–4 (which
 * byte sequences are not UTF-8), IEEE 754 (the largest finite double is about 1.8e308).
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, test } from "vitest";
import { checkBatch, type ReadinessReport } from "@/lib/readiness";
import { checkFile } from "@/lib/readiness/node";
import { checkStream, rangeWorkerScript } from "@/lib/readiness/node-stream";
import { poolCsvLines } from "@/lib/pool/export";
import type { StudyPool } from "@/lib/pool/pool";
import { csvRecords } from "@/lib/readiness/records";
import { HEADER, chunks, cleanRows, csvOf, plan, type Row } from "../fixtures/engine/data";

const P = plan();
const WORKER = path.resolve("tests/fixtures/engine/range-worker.ts");
const strip = ({ state: _s, timings: _t, ...rest }: ReadinessReport) => rest;
const tmpFile = (text: string | Uint8Array) => {
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "tributary-reader-")), "batch.csv");
  fs.writeFileSync(file, text);
  return file;
};

describe("defect 1: a quoted header read by worker threads", () => {
  test('"plot","yield",… with two workers gives the one-pass report (no false plan.column-missing)', async () => {
    const text = csvOf(
      HEADER.map((h) => `"${h}"`),
      cleanRows(4000),
    );
    const file = tmpFile(text);
    const one = await checkBatch(chunks(text, 1 << 16), P);
    const two = await checkFile(file, P, { minBytes: 0, workers: 2, workerScript: WORKER });
    expect(one.findings.map((f) => f.code)).not.toContain("plan.column-missing");
    expect(two.findings.map((f) => f.code)).toEqual(one.findings.map((f) => f.code));
    expect(two.rows).toEqual(one.rows);
    expect(two.fit!.F!).toBeCloseTo(one.fit!.F!, 6);
  });
});

describe("defect 2: the pool export numbers rows as the report does", () => {
  test("after a quoted value over two lines and a blank line, the export's source_row is the report's row", async () => {
    const rows: Row[] = cleanRows(3);
    rows[0]![1] = '"harrowgate,\nnorth"'; // record 1: lines 2–3
    rows[1]![4] = "abc"; // record 2, after a blank line: line 5
    const csv = `${HEADER.join(",")}\n${rows[0]!.join(",")}\n\n${rows[1]!.join(",")}\n${rows[2]!.join(",")}\n`;
    const report = await checkBatch(chunks(csv, 7), P);
    expect(report.findings.find((f) => f.code === "type.mismatch")?.rows).toEqual([5]);
    const pool = {
      plan: P,
      members: [
        {
          fileKey: "k",
          organisationName: "Org",
          batchPublicId: "b1",
          batchTitle: "B",
          version: 1,
          decimal: ".",
        },
      ],
    } as unknown as StudyPool;
    const open = async () => new Response(csv).body!;
    const lines: string[] = [];
    for await (const l of poolCsvLines(pool, open)) lines.push(l);
    // provenance columns: organisation, batch, batch_title, version, source_row
    const sourceRows = lines.slice(1).map((l) => Number(l.split(",")[4]));
    expect(sourceRows).toEqual([2, 5, 6]);
    const recs: number[] = [];
    for await (const r of csvRecords(chunks(csv, 5))) if (r.kind === "row") recs.push(r.line);
    expect(recs).toEqual([2, 5, 6]);
  });
});

describe("defect 3: invalid UTF-8 (RFC 3629) is unreadable, with the offset of the first bad byte", () => {
  const head = new TextEncoder().encode(
    `${HEADER.join(",")}\n1,harrowgate,loam,Corrin,1,2,3,2026-04-01,4\n2,`,
  );
  test.each([
    ["an overlong sequence", [0xe0, 0x80, 0x80]],
    ["a surrogate", [0xed, 0xa0, 0x80]],
    ["a code point above U+10FFFF", [0xf4, 0x90, 0x80, 0x80]],
    ["an overlong two-byte form", [0xc0, 0xaf]],
  ])("%s", async (_name, bad) => {
    const rest = new TextEncoder().encode(",loam,Corrin,1,2,3,2026-04-01,4\n");
    const bytes = new Uint8Array([...head, ...bad, ...rest]);
    for (const size of [3, 1 << 16]) {
      const r = await checkBatch(chunks(bytes, size), P);
      expect(r.status).toBe("unreadable");
      expect(r.findings[0]!.detail).toEqual({ kind: "encoding", byte: head.length });
      expect(r.findings[0]!.message).toMatch(`byte ${head.length} `);
    }
  });
  test("valid four-byte and three-byte characters split across chunks are read", async () => {
    const rows = cleanRows(5);
    rows[2]![1] = "Gärtnerei 🌾 東";
    const r = await checkBatch(chunks(csvOf(HEADER, rows), 1), P);
    expect(r.status).toBe("checked");
  });
});

describe("defect 4: a number too large for a double is a finding with its row, never a crash", () => {
  test.each([
    ["1e999", "1e999"],
    ["a run of 300,000 digits", "9".repeat(300_000)],
  ])("%s in a numeric predictor", async (_name, value) => {
    const rows = cleanRows(50);
    rows[9]![HEADER.indexOf("nitrogen")] = value;
    const r = await checkBatch(chunks(csvOf(HEADER, rows), 1 << 16), P);
    expect(r.status).toBe("checked");
    const f = r.findings.find((x) => x.code === "type.mismatch" && x.columns[0] === "nitrogen");
    expect(f?.rows).toEqual([11]);
    expect(f!.message.length).toBeLessThan(1000);
    expect(r.fit).not.toBeNull();
  });
});

describe("defect 5: a long field costs time in proportion to its length, in every column type", () => {
  // Compared against a file of the same size without the long field (not a wall-clock bound):
  // with quadratic work a 1 MB field costs ~10¹² steps, thousands of times the plain file.
  const base = cleanRows(2000);
  const plainText = csvOf(HEADER, base);
  async function cost(text: string): Promise<number> {
    let best = Infinity;
    for (let k = 0; k < 3; k++) {
      const t = performance.now();
      const r = await checkBatch(chunks(text, 1 << 16), P);
      best = Math.min(best, performance.now() - t);
      expect(r.status).toBe("checked");
    }
    return best;
  }
  test.each([
    ["key", "plot_id", (n: number) => "7".repeat(n)],
    ["text", "farm", (n: number) => "a, b ".repeat(n / 5)],
    ["category", "soil", (n: number) => "x".repeat(n)],
    ["number", "nitrogen", (n: number) => "1".repeat(n - 1) + "x"],
    ["date", "sow_date", (n: number) => "2".repeat(n - 1) + "-"],
  ])("a 1 MB field in the %s column", async (_kind, column, long) => {
    const n = 1_000_000;
    const rows = base.map((r) => [...r]);
    rows[500]![HEADER.indexOf(column)] = `"${long(n)}"`;
    const withLong = csvOf(HEADER, rows);
    // the same size without it: more ordinary rows
    const more = cleanRows(
      Math.ceil((withLong.length - plainText.length) / (plainText.length / base.length)) + 2000,
      7,
      5000,
    );
    const plain = csvOf(HEADER, more).slice(0, withLong.length);
    const plainSized = plain.slice(0, plain.lastIndexOf("\n") + 1);
    expect(Math.abs(plainSized.length - withLong.length)).toBeLessThan(200);
    const a = await cost(withLong);
    const b = await cost(plainSized);
    expect(a / b).toBeLessThan(4);
  });
});

describe("parallel splitting keeps records whole", () => {
  test("split guesses inside quoted fields with line breaks: the ranges are read again from the true boundary", async () => {
    const rows = cleanRows(3000);
    // every row's farm is a quoted value over several lines: most line starts are inside a record
    for (const r of rows) r[1] = `"farm\n\nnorth, ""upper""\n"`;
    const text = csvOf(HEADER, rows);
    const file = tmpFile(text);
    const one = await checkBatch(chunks(text, 1 << 16), P);
    for (const workers of [2, 3]) {
      const par = await checkFile(file, P, { minBytes: 0, workers, workerScript: WORKER });
      expect(strip(par).rows).toEqual(strip(one).rows);
      expect(par.findings).toEqual(one.findings);
    }
  });
});

describe("the server's check of a byte stream uses all cores", () => {
  test("checkStream spools a large stream and checks it with worker threads: the one-pass report", async () => {
    const rows = cleanRows(3000);
    for (const r of rows.slice(0, 1000)) r[1] = '"two\nlines"';
    rows[2500]![4] = "abc";
    const text = csvOf(HEADER, rows);
    const one = await checkBatch(chunks(text, 1 << 16), P);
    const par = await checkStream(chunks(text, 5000), P, { workers: 2, minBytes: 10_000 });
    expect(par.findings).toEqual(one.findings);
    expect(par.rows).toEqual(one.rows);
    expect(par.findings.find((f) => f.code === "type.mismatch")?.rows).toEqual([3502]);
    const small = await checkStream(chunks(text, 5000), P, { workers: 2 });
    expect(small.findings).toEqual(one.findings);
  });

  test("its threads start from the command's bundle of the engine, fresh, not from the sources through tsx", async () => {
    const script = await rangeWorkerScript();
    expect(path.relative(process.cwd(), script)).toBe(
      path.join("lib", "readiness", "bin", "tributary-check.mjs"),
    );
    const { BUNDLE, bundleIsFresh } = await import("@/lib/readiness/bin/bundle.mjs");
    expect(fs.existsSync(BUNDLE)).toBe(true);
    expect(bundleIsFresh()).toBe(true);
  });
});
