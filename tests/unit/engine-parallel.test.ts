/**
 * checkFile (lib/readiness/node.ts) splits a large file into byte ranges read by worker threads
 * and merges what they gathered: the report must equal one pass over the file (checkBatch) —
 * counts, sample rows, duplicates across ranges, the fit — up to floating-point merge order.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, test } from "vitest";
import { checkBatch, parsePlan, type ReadinessReport } from "@/lib/readiness";
import { checkFile } from "@/lib/readiness/node";
import { HEADER, chunks, cleanRows, csvOf, plan, rng } from "../fixtures/engine/data";
import { close } from "../helpers/close";

describe("the byte-span hot path equals the string path", () => {
  test("a 30,000-row file with defects of every row-level kind, CRLF line ends and blank lines", async () => {
    const rows = cleanRows(30_000);
    const S = HEADER.indexOf("soil");
    rows[100]![S] = "peat";
    rows[7000]![S] = "Clay";
    rows[20_000] = [...rows[10]!];
    rows[25_000]![HEADER.indexOf("nitrogen")] = "n/a";
    rows[26_000]![HEADER.indexOf("nitrogen")] = "12,5";
    rows[27_000]![HEADER.indexOf("rainfall")] = -999;
    rows[27_001]![HEADER.indexOf("rainfall")] = -999;
    rows[28_000]![HEADER.indexOf("irrigation")] = "NA";
    rows[29_000] = [1, 2, 3];
    const text = csvOf(HEADER, rows, ";", "\r\n").replace("\r\n5;", "\r\n\r\n5;");
    const p = plan();
    const fast = await checkBatch(chunks(text, 100_000), p);
    const slow = await checkBatch(chunks(text, 100_000), p, { path: "strings" });
    const strip = ({ timings: _t, ...rest }: ReadinessReport) => rest;
    expect(fast.findings.length).toBeGreaterThan(6);
    close(strip(slow), strip(fast), "report");
  });
});

describe("levels found by their bytes equal the string path", () => {
  test("a text key past the level table's cap, repeated keys, non-ASCII levels and variants", async () => {
    // 30,000 codes fill the text column's level table (LEVEL_CAP, 5,000) and then count as
    // overflow without a string each; codes repeated past the cap give key examples from bytes
    // decoded only then; a numeric key's examples are its numbers
    // a remark longer than the bytes a level is indexed by (256), before and after the cap
    const long = `"${"a long remark, ".repeat(24)}the end"`;
    // one-letter levels beside the two-letter missing-value token "NA"
    const grades = ["A", "B", "N", "NA"];
    const lines = ["code,num,site,crop,y,remark,grade"];
    const sites = ["Öland", "Älvdal", "Côte", "Ribe"];
    const crops = ["barley", "oats", "Barley", "oats "];
    for (let i = 0; i < 30_000; i++) {
      const code =
        i % 2000 === 7 && i > 5000
          ? `P${String(i - 4000).padStart(6, "0")}`
          : `P${String(i).padStart(6, "0")}`;
      const num = i === 9000 ? "NA" : i % 2500 === 11 && i > 2500 ? String(i - 2500) : String(i);
      // and "NA" now and then, also past the cap: missing, not a new value
      const remark = i % 5000 === 3 ? long : i % 1000 === 500 ? "NA" : `r${i}`;
      lines.push(
        `${code},${num},${sites[i % 4]},${crops[i % 7 === 0 ? 2 + (i % 2) : i % 2]},${(i % 89) / 10},${remark},${grades[i % 4]}`,
      );
    }
    lines.push("P029990,29990x,Ribe,oats,1.0,x,A", "P029991,29991,Ribe,oats,1.0,x,B");
    const parsed = parsePlan({
      columns: [
        { name: "code", role: "key", type: "text" },
        { name: "num", role: "key", type: "integer" },
        { name: "site", role: "predictor", type: "category", levels: ["Öland", "Älvdal", "Côte", "Ribe"] },
        { name: "crop", role: "predictor", type: "category", levels: ["barley", "oats"] },
        { name: "y", role: "response", type: "number" },
        { name: "remark", role: "carry", type: "text" },
        { name: "grade", role: "predictor", type: "category", levels: ["A", "B", "N"] },
      ],
      missingTokens: ["NA"],
    });
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
    const text = `${lines.join("\n")}\n`;
    const fast = await checkBatch(chunks(text, 65_536), parsed.plan);
    const slow = await checkBatch(chunks(text, 65_536), parsed.plan, { path: "strings" });
    const strip = ({ timings: _t, ...rest }: ReadinessReport) => rest;
    close(strip(slow), strip(fast), "report");
    const dup = fast.findings.filter((f) => f.code === "key.duplicate");
    // rows 6,007 and 8,007 (past the cap) repeat the codes of rows 2,007 and 4,007
    expect(dup.find((f) => f.message.includes("“code”"))?.message).toContain("“P002007”, “P004007”");
    expect(dup.find((f) => f.message.includes("“num”"))?.message).toContain("(e.g. “11”, “29991”)");
    // the long remark is one level counted six times on both paths, not an overflow past the cap
    type Col = { name: string; levels: [string, number, number][] | null };
    const remark = (fast.state as { columns: Col[] }).columns.find((c) => c.name === "remark");
    expect(remark?.levels?.find(([l]) => l === long.slice(1, -1))?.[1]).toBe(6);
    const grade = fast.columns.find((c) => c.name === "grade");
    expect(grade?.missing.count).toBe(7500);
    expect(fast.columns.find((c) => c.name === "remark")?.missing.count).toBe(30);
    const levels = fast.findings.find((f) => f.code === "level.unknown" && f.message.includes("crop"));
    expect(levels?.message).toContain("“Barley”");
    expect(levels?.message).toContain("“oats ”");
  });
});

describe("decimal commas read from the bytes equal the string path", () => {
  test("30,000 rows of `12,5`-style numbers, with odd ones among them", async () => {
    // past the first 20,000 values (type evidence) and the first five examples, a plain decimal
    // comma is read from the bytes; these must stay what read() makes of them
    const odd = [",5", "-,5", "5,", "1,2,3", "1.234,5", "+1,5", "1,5e3", "12,50000000000000001", "NA", ""];
    const r = rng(61);
    const rows = Array.from({ length: 30_000 }, (_, i) => {
      const v =
        i % 997 === 13
          ? odd[Math.floor(i / 997) % odd.length]!
          : `${i % 3 ? "" : "-"}${(r() * 1000).toFixed(1 + (i % 4)).replace(".", ",")}`;
      return `P${i};${v};${(i % 89) / 10}`;
    });
    const parsed = parsePlan({
      columns: [
        { name: "code", role: "key", type: "text" },
        { name: "x", role: "predictor", type: "number" },
        { name: "y", role: "response", type: "number" },
      ],
      missingTokens: ["NA"],
    });
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
    const text = `code;x;y\n${rows.join("\n")}\n`;
    const fast = await checkBatch(chunks(text, 65_536), parsed.plan);
    const slow = await checkBatch(chunks(text, 65_536), parsed.plan, { path: "strings" });
    const strip = ({ timings: _t, ...rest }: ReadinessReport) => rest;
    close(strip(slow), strip(fast), "report");
    expect(fast.findings.map((f) => f.code)).toContain("number.decimal-comma");
  });
});

describe("day/month dates read from the bytes equal the string path", () => {
  test("two-digit and one-digit parts, '/', '.' and '-', a mixed separator, ambiguous and not", async () => {
    const dates = ["23/06/2026", "3/4/2026", "03.04.2026", "12-11-26", "1/12/2026", "12/1/2026", "5/5/2026"];
    const odd = ["31/02/2026x", "1/2.2026", " 3/4/2026", "13/13/2026", "00/05/2026"];
    const body = [...dates, ...odd].map((d, i) => `P${i},${d},${i}`).join("\n");
    const p = {
      columns: [
        { name: "code", role: "key", type: "text" },
        { name: "when", role: "carry", type: "date" },
        { name: "y", role: "response", type: "number" },
      ],
    };
    const parsed = parsePlan(p);
    if (!parsed.ok) throw new Error("plan");
    const text = `code,when,y\n${body}\n`;
    const fast = await checkBatch(chunks(text, 7), parsed.plan);
    const slow = await checkBatch(chunks(text, 7), parsed.plan, { path: "strings" });
    const strip = ({ timings: _t, ...rest }: ReadinessReport) => rest;
    close(strip(slow), strip(fast), "report");
    // by hand (common practice for a/b/yyyy dates: a day of 1–31 and a month of 1–12 in either
    // order; a trailing letter is no date): lines 9, 12, 13; 23/06 settles the order, which
    // lib/readiness/CHECKS.md's date.ambiguous rule says then raises no warning
    expect(fast.findings.find((f) => f.code === "type.mismatch")?.rows).toEqual([9, 12, 13]);
    expect(fast.findings.some((f) => f.code === "date.ambiguous")).toBe(false);
  });
});

describe("a quoted line break deep in the file keeps later line numbers", () => {
  test("a quoted two-line value deep in the file shifts later rows by one line", async () => {
    const rows = cleanRows(20_000);
    rows[12_000]![HEADER.indexOf("farm")] = '"Harrowgate,\nnorth"';
    rows[15_000]![HEADER.indexOf("nitrogen")] = "n/a";
    const r = await checkBatch(chunks(csvOf(HEADER, rows), 65_536), plan());
    // data row 15,000 (0-based) is line 15,002, plus one for the line break inside row 12,000
    expect(r.findings.find((f) => f.code === "type.mismatch")?.rows).toEqual([15_003]);
    expect(r.rows.total).toBe(20_000);
  });
});

describe("checkFile with worker threads equals one pass", () => {
  test("3 ranges, defects in every range and duplicates across ranges", async () => {
    const rows = cleanRows(6000);
    rows[100]![HEADER.indexOf("soil")] = "peat";
    rows[3000] = [...rows[10]!]; // the same row in the first and second range
    rows[4500]![HEADER.indexOf("nitrogen")] = "n/a";
    rows[5900]![HEADER.indexOf("irrigation")] = "";
    rows[5950]![HEADER.indexOf("yield")] = "";
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "tributary-par-")), "batch.csv");
    fs.writeFileSync(file, csvOf(HEADER, rows));
    const p = plan();
    const one = await checkBatch(fs.createReadStream(file), p);
    const par = await checkFile(file, p, {
      minBytes: 0,
      workers: 3,
      workerScript: path.resolve("tests/fixtures/engine/range-worker.ts"),
    });
    // key examples of repeats across ranges are not known to the merge (only hashes travel): compare without them
    const strip = ({ state: _s, timings: _t, findings, ...rest }: ReadinessReport) => ({
      ...rest,
      findings: findings.map(({ detail: _d, ...f }) =>
        f.code === "key.duplicate" ? { ...f, message: "" } : f,
      ),
    });
    expect(par.findings.map((f) => f.code)).toEqual(one.findings.map((f) => f.code));
    expect(par.findings.find((f) => f.code === "row.duplicate")?.rows).toEqual([3002]);
    expect(par.findings.find((f) => f.code === "key.duplicate")?.rows).toEqual([3002]);
    close(strip(one), strip(par), "report");
  });
});

describe("type inference over ranges counts the values one pass counts", () => {
  // One pass infers a column's type from its first INFER_LIMIT (20,000) non-missing values. Two
  // ranges of 30,000 rows each counted their own first 20,000: summed, the merge saw 40,000 values,
  // and a column of unique ids (5,000 distinct kept, LEVEL_CAP) passed the category rule
  // "distinct ≤ 20 % of the values seen" (8,000) that one pass (4,000) does not: text became category.
  test("a column of unique plot ids is text in both, over 60,000 rows in 2 ranges", async () => {
    const n = 60_000;
    const lines = ["plot_code,yield"];
    for (let i = 0; i < n; i++)
      lines.push(`P${String(i).padStart(6, "0")},${(5 + (i % 97) / 10).toFixed(1)}`);
    const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), "tributary-infer-")), "batch.csv");
    fs.writeFileSync(file, `${lines.join("\n")}\n`);
    const parsed = parsePlan({
      columns: [{ name: "yield", type: "number", role: "response" }],
      model: { response: "yield", terms: [] },
    });
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
    const one = await checkBatch(fs.createReadStream(file), parsed.plan);
    const par = await checkFile(file, parsed.plan, { minBytes: 0, workers: 2, inThread: true });
    const type = (r: ReadinessReport) => r.columns.find((c) => c.name === "plot_code")?.inferredType;
    expect(type(one)).toBe("text");
    expect(type(par)).toBe("text");
  });
});
