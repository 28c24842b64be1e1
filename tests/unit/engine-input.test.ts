/**
 * Bad and unusual input: every case yields a report (never a throw) whose finding tells the
 * provider what to do; memory stays bounded on the pathological ones.
 * The bad-input list itself, with each case's promised outcome, is tests/fixtures/hostile-files.ts
 * (shared with the API pipeline and browser tests); expected messages are this product's own
 * wording (lib/readiness/CHECKS.md "What the engine reads", file.unreadable); byte offsets are counted by hand there.
 */
import { describe, expect, test } from "vitest";
import { checkBatch } from "@/lib/readiness";
import { HEADER, chunks, cleanRows, csvOf, plan, webStream } from "../fixtures/engine/data";
import { ENGINE_DATASET, hostileFile, hostileFiles, type HostileOutcome } from "../fixtures/hostile-files";

const P = plan();
const CASES = hostileFiles(ENGINE_DATASET);
const bytesOf = (id: string) => hostileFile(ENGINE_DATASET, id).bytes();

describe("the bad-input list (tests/fixtures/hostile-files.ts): each case ends in the outcome it promises", () => {
  test.each(CASES.filter((c) => c.expect.kind !== "checked"))(
    "$name: unreadable, one actionable file.unreadable blocker",
    async (c) => {
      // a file the intake refuses must still be refused by the engine if it ever reached it
      const want =
        c.expect.kind === "refused" ? c.expect.engine : (c.expect as { message: RegExp; fix: RegExp });
      const r = await checkBatch(chunks(c.bytes(), 64 << 10), P);
      expect(r.status).toBe("unreadable");
      const f = r.findings.find((x) => x.code === "file.unreadable");
      expect(f?.severity).toBe("blocker");
      expect(f?.message).toMatch(want.message);
      expect(f?.fix).toMatch(want.fix);
      expect(r.counts.blocker).toBe(1);
    },
  );

  test.each(CASES.filter((c) => c.expect.kind === "checked"))(
    "$name: read and reported with its findings",
    async (c) => {
      const want = c.expect as Extract<HostileOutcome, { kind: "checked" }>;
      const r = await checkBatch(chunks(c.bytes(), 333), P);
      expect(r.status).toBe("checked");
      const codes = r.findings.map((f) => f.code);
      for (const code of want.findings) expect(codes).toContain(code);
      for (const [code, rows] of Object.entries(want.rows ?? {}))
        expect(r.findings.find((f) => f.code === code)?.rows).toEqual(rows);
      if (want.file?.delimiter) expect(r.file?.delimiter).toBe(want.file.delimiter);
      if (want.file?.decimal) expect(r.file?.decimal).toBe(want.file.decimal);
    },
  );
});

describe("bounded memory on pathological files", () => {
  /** Peak heap growth while checking `bytes` (sampled at every progress report and at the end). */
  async function peakGrowth(bytes: Uint8Array) {
    global.gc?.();
    const before = process.memoryUsage().heapUsed;
    let peak = before;
    const r = await checkBatch(chunks(bytes, 1 << 16), P, {
      onProgress: () => (peak = Math.max(peak, process.memoryUsage().heapUsed)),
    });
    peak = Math.max(peak, process.memoryUsage().heapUsed);
    return { r, growth: peak - before };
  }

  test("a 20 MB line without a newline is refused with bounded heap growth", async () => {
    const { r, growth } = await peakGrowth(bytesOf("long-line"));
    expect(r.status).toBe("unreadable");
    expect(r.findings[0]!.message).toMatch(/Line 2 runs on for more than 4 MB without a line break/);
    // the record cap is 4 Mi characters; allow for copies while concatenating (limit chosen well under the 20 MB input)
    expect(growth).toBeLessThan(64 << 20);
  });

  test("50,000 columns are refused with a message, bounded heap growth", async () => {
    const { r, growth } = await peakGrowth(bytesOf("wide"));
    expect(r.status).toBe("unreadable");
    expect(r.findings[0]!.message).toMatch(/50,000 columns; the engine reads at most 2,000/);
    expect(r.findings[0]!.fix).toMatch(/delimiter/);
    expect(growth).toBeLessThan(64 << 20);
  });

  test("an unclosed quote that swallows a large file is refused once the record passes the cap", async () => {
    const { r, growth } = await peakGrowth(bytesOf("unclosed-quote-large"));
    expect(r.status).toBe("unreadable");
    expect(r.findings[0]!.message).toMatch(
      /quoted field that starts on line 2 is never closed: more than 4 MB/,
    );
    expect(growth).toBeLessThan(64 << 20);
  });

  test("with a tighter record cap an unclosed quote is refused as soon as the record passes it", async () => {
    const body = csvOf(HEADER, cleanRows(30_000));
    const text = `${HEADER.join(",")}\n1,"harrowgate,loam,A,1,1,1,2026-04-01,1\n${body}`;
    const r = await checkBatch(chunks(text, 1 << 16), P, { limits: { maxRecordChars: 200_000 } });
    expect(r.status).toBe("unreadable");
    expect(r.findings[0]!.message).toMatch(/quoted field that starts on line 2 is never closed/);
  });
});

describe("readable variants", () => {
  const rows = cleanRows(60);
  test.each([
    { name: "comma, LF", text: csvOf(HEADER, rows), delimiter: "," },
    { name: "UTF-8 BOM, CRLF", text: "\uFEFF" + csvOf(HEADER, rows, ",", "\r\n"), delimiter: "," },
    { name: "semicolon", text: csvOf(HEADER, rows, ";"), delimiter: ";" },
    { name: "tab", text: csvOf(HEADER, rows, "\t"), delimiter: "\t" },
    { name: "no final newline", text: csvOf(HEADER, rows).trimEnd(), delimiter: "," },
  ])("$name: same figures as the plain file", async ({ text, delimiter }) => {
    const base = await checkBatch(chunks(csvOf(HEADER, rows)), P);
    const r = await checkBatch(webStream(text, 333), P);
    expect(r.status).toBe("checked");
    expect(r.file?.delimiter).toBe(delimiter);
    expect(r.rows).toEqual({ total: 60, complete: 60 });
    expect(r.fit?.F).toBeCloseTo(base.fit!.F!, 9);
    expect(r.findings.map((f) => f.code)).toEqual(base.findings.map((f) => f.code));
  });

  test("quoted fields with delimiters and newlines; rows are numbered by the line where the record starts", async () => {
    const lines = [
      HEADER.join(","),
      `1,"Harrowgate, north field",loam,Amberlea,100,50,200,2026-04-01,4.1`,
      `2,"two\nline farm",clay,Corrin,110,55,210,2026-04-02,4.3`,
      `3,harrowgate,sand,Halvard,abc,60,220,2026-04-03,4.4`,
    ];
    const r = await checkBatch(chunks(lines.join("\n") + "\n", 7), P);
    expect(r.status).toBe("checked");
    const tm = r.findings.find((f) => f.code === "type.mismatch");
    // record 3 starts on line 5: header (1), record 1 (2), record 2 spans lines 3–4
    expect(tm?.rows).toEqual([5]);
    expect(tm?.detail?.offenders).toEqual([{ value: "abc", count: 1 }]);
  });

  test("a quoted value spanning 70,000 lines (700 kB) is read whole, and the rows after it keep their line numbers", async () => {
    // the reader waits for more text while such a record is open; nothing may be lost or renumbered
    const rows = cleanRows(30);
    rows[9]![1] = `"${"note line\n".repeat(70_000)}"`;
    rows[20]![4] = "abc";
    const text = csvOf(HEADER, rows);
    for (const path of ["bytes", "strings"] as const) {
      const r = await checkBatch(chunks(text, 1 << 16), P, { path });
      expect(r.status).toBe("checked");
      expect(r.rows.total).toBe(30);
      // header (1), rows 1–9 (2–10), row 10 starts on line 11 and spans 70,001 lines, so row 11 is
      // line 70,012 and row 21 (index 20) line 70,022
      expect(r.findings.find((f) => f.code === "type.mismatch")?.rows).toEqual([70_022]);
    }
  });

  test("header only: checked, df.none", async () => {
    const r = await checkBatch(chunks(bytesOf("header-only")), P);
    expect(r.status).toBe("checked");
    expect(r.rows.total).toBe(0);
    expect(r.findings.map((f) => f.code)).toContain("df.none");
  });

  test("all values missing in a predictor: missing.column blocker and df.none", async () => {
    const r = await checkBatch(chunks(bytesOf("column-missing")), P);
    const m = r.findings.find((f) => f.code === "missing.column" && f.columns[0] === "irrigation");
    expect(m?.severity).toBe("blocker");
    expect(m?.rowCount).toBe(30);
    expect(r.findings.map((f) => f.code)).toContain("df.none");
  });

  test("semicolons with decimal commas: read, and number.decimal-comma says how to fix", async () => {
    const r = await checkBatch(chunks(bytesOf("decimal-comma")), P);
    expect(r.status).toBe("checked");
    expect(r.file?.delimiter).toBe(";");
    expect(r.file?.decimal).toBe(",");
    const f = r.findings.filter((x) => x.code === "number.decimal-comma");
    expect(f.length).toBeGreaterThan(0);
    expect(f[0]!.severity).toBe("blocker");
    expect(f[0]!.fix).toMatch(/decimal separator/);
    expect(r.findings.some((x) => x.code === "type.mismatch")).toBe(false);
    expect(r.rows.complete).toBe(30);
  });

  test("ragged rows and duplicate headers are reported, not fatal", async () => {
    const text =
      `${HEADER.join(",")},yield\n` +
      cleanRows(5)
        .map((r) => [...r, 1].join(","))
        .join("\n") +
      "\n1,2,3\n";
    const r = await checkBatch(chunks(text), P);
    expect(r.status).toBe("checked");
    const codes = r.findings.map((f) => f.code);
    expect(codes).toContain("header.duplicate");
    expect(r.findings.find((f) => f.code === "row.ragged")?.rows).toEqual([7]);
  });
});
