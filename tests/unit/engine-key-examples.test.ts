/**
 * `key.duplicate` names up to ten repeated key values with their counts. A file read in byte
 * ranges (threads) gives exactly the message and examples one pass gives, when the repeats lie
 * in a later range than the first occurrence, and when more than ten values repeat
 * (lib/readiness/key-examples.ts counts them again after the merge).
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { expect, test } from "vitest";
import { checkBatch } from "@/lib/readiness";
import { checkFile } from "@/lib/readiness/node";
import { HEADER, chunks, cleanRows, csvOf, plan } from "../fixtures/engine/data";

const P = plan();
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tributary-key-examples-"));
const keyFindings = (r: { findings: { code: string; message: string }[] }) =>
  r.findings.filter((f) => f.code === "key.duplicate");

test("keys first seen near the start repeat near the end: the same examples on one thread and on two", async () => {
  const rows = cleanRows(4000);
  const id = HEADER.indexOf("plot_id");
  // thirty keys of the first rows again near the end (another range), and one repeat inside the end
  for (let i = 0; i < 30; i++) rows[3900 + i]![id] = rows[5 + i]![id]!;
  rows[3990]![id] = rows[3950]![id]!;
  const text = csvOf(HEADER, rows);
  const file = path.join(dir, "batch.csv");
  fs.writeFileSync(file, text);
  const one = keyFindings(await checkBatch(chunks(text, 1 << 16), P));
  expect(one).toHaveLength(1);
  // the first ten repeated values, in the order their repeats occur (one pass)
  expect(one[0]!.message).toContain("(e.g. “6”, “7”, “8”, “9”, “10”)");
  for (const opts of [
    { inThread: true },
    { workerScript: path.resolve("tests/fixtures/engine/range-worker.ts") },
  ]) {
    const two = keyFindings(await checkFile(file, P, { workers: 2, minBytes: 0, ...opts }));
    expect(two).toEqual(one);
  }
});
