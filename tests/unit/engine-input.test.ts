/**
 * Bad and unusual input: every case yields a report (never a throw) whose finding tells the
 * provider what to do; memory stays bounded on the pathological ones.
 * Expected messages are this product's own wording (CHECKS.md "Inputs"); byte offsets are
 * counted by hand from the invented inputs below.
 */
import { describe, expect, test } from "vitest";
import { checkBatch } from "@/lib/readiness";
import { HEADER, chunks, cleanRows, csvOf, plan, webStream } from "../fixtures/engine/data";

const P = plan();
const enc = (s: string) => new TextEncoder().encode(s);
const cat = (...parts: (Uint8Array | number[])[]) => {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
};
const clean = csvOf(HEADER, cleanRows(40));

function utf16le(s: string, bom: boolean): Uint8Array {
  const out = new Uint8Array((bom ? 2 : 0) + s.length * 2);
  let o = 0;
  if (bom) {
    out[0] = 0xff;
    out[1] = 0xfe;
    o = 2;
  }
  for (let i = 0; i < s.length; i++) {
    out[o++] = s.charCodeAt(i) & 0xff;
    out[o++] = s.charCodeAt(i) >> 8;
  }
  return out;
}

describe("unreadable files get status unreadable and an actionable file.unreadable finding", () => {
  test.each([
    { name: "empty file", bytes: new Uint8Array(0), expect: /empty/i, fix: /export/i },
    { name: "only a BOM and blank lines", bytes: cat([0xef, 0xbb, 0xbf], enc("\n\n")), expect: /no text/i, fix: /header/i },
    { name: "xlsx workbook (zip signature PK\\x03\\x04)", bytes: cat([0x50, 0x4b, 0x03, 0x04], new Uint8Array(200)), expect: /Excel workbook/, fix: /CSV/ },
    { name: "old .xls (OLE2 signature)", bytes: cat([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1], new Uint8Array(200)), expect: /\.xls/, fix: /CSV/ },
    { name: "UTF-16 with BOM", bytes: utf16le(clean.slice(0, 400), true), expect: /UTF-16/, fix: /UTF-8/ },
    { name: "UTF-16 without BOM (NUL pattern)", bytes: utf16le(clean.slice(0, 400), false), expect: /UTF-16/, fix: /UTF-8/ },
    // "plot_id,soil\n" is 13 bytes, so the NUL written after it is byte 13
    { name: "NUL byte in text", bytes: cat(enc("plot_id,soil\n"), [0], enc("1,clay\n")), expect: /binary content at byte 13/, fix: /CSV/ },
    { name: "binary bytes at byte 0", bytes: cat([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]), expect: /byte 0/, fix: /CSV/ },
    // "soil\n" is 5 bytes; 0xE9 is Latin-1 "é" (argil\xe9e)
    { name: "Latin-1 text", bytes: cat(enc("soil\n"), enc("argil"), [0xe9], enc("e\n")), expect: /not valid UTF-8: byte 10.*Latin-1/, fix: /UTF-8/ },
    { name: "unclosed quote at the end", bytes: enc(`${HEADER.join(",")}\n1,"harrowgate,loam\n2,x\n`), expect: /never closed/, fix: /closing "/ },
  ])("$name", async ({ bytes, expect: msg, fix }) => {
    const r = await checkBatch(chunks(bytes, 64), P);
    expect(r.status).toBe("unreadable");
    const f = r.findings.find((x) => x.code === "file.unreadable");
    expect(f?.severity).toBe("blocker");
    expect(f?.message).toMatch(msg);
    expect(f?.fix).toMatch(fix);
    expect(r.counts.blocker).toBe(1);
  });
});

describe("bounded memory on pathological files", () => {
  test("a 20 MB line without a newline is refused with bounded heap growth", async () => {
    const size = 20 << 20;
    async function* gen() {
      yield enc(`${HEADER.join(",")}\n`);
      const block = enc("1234567,".repeat(8192)); // 64 KiB
      for (let i = 0; i < size / block.length; i++) yield block;
    }
    global.gc?.();
    const before = process.memoryUsage().heapUsed;
    let peak = before;
    const r = await checkBatch(gen(), P, { onProgress: () => (peak = Math.max(peak, process.memoryUsage().heapUsed)) });
    peak = Math.max(peak, process.memoryUsage().heapUsed);
    expect(r.status).toBe("unreadable");
    expect(r.findings[0]!.message).toMatch(/Line 2 runs on for more than 4 MB without a line break/);
    // the record cap is 4 Mi characters; allow for copies while concatenating (limit chosen well under the 20 MB input)
    expect(peak - before).toBeLessThan(64 << 20);
  });

  test("50,000 columns are refused with a message, bounded heap growth", async () => {
    const header = Array.from({ length: 50_000 }, (_, i) => `c${i}`).join(",");
    const row = Array.from({ length: 50_000 }, () => "1").join(",");
    const before = process.memoryUsage().heapUsed;
    const r = await checkBatch(chunks(`${header}\n${row}\n${row}\n`, 1 << 16), P);
    expect(r.status).toBe("unreadable");
    expect(r.findings[0]!.message).toMatch(/50,000 columns; the engine reads at most 2,000/);
    expect(r.findings[0]!.fix).toMatch(/delimiter/);
    expect(process.memoryUsage().heapUsed - before).toBeLessThan(64 << 20);
  });

  test("an unclosed quote that swallows a large file is refused once the record passes the cap", async () => {
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

  test("header only: checked, df.none", async () => {
    const r = await checkBatch(chunks(HEADER.join(",") + "\n"), P);
    expect(r.status).toBe("checked");
    expect(r.rows.total).toBe(0);
    expect(r.findings.map((f) => f.code)).toContain("df.none");
  });

  test("all values missing in a predictor: missing.column blocker and df.none", async () => {
    const rows2 = cleanRows(30).map((r) => r.map((v, j) => (j === 5 ? "" : v)));
    const r = await checkBatch(chunks(csvOf(HEADER, rows2)), P);
    const m = r.findings.find((f) => f.code === "missing.column" && f.columns[0] === "irrigation");
    expect(m?.severity).toBe("blocker");
    expect(m?.rowCount).toBe(30);
    expect(r.findings.map((f) => f.code)).toContain("df.none");
  });

  test("semicolons with decimal commas: read, and number.decimal-comma says how to fix", async () => {
    const text = csvOf(HEADER, cleanRows(30).map((r) => r.map((v) => (typeof v === "number" && !Number.isInteger(v) ? String(v).replace(".", ",") : v))), ";");
    const r = await checkBatch(chunks(text), P);
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
    const text = `${HEADER.join(",")},yield\n` + cleanRows(5).map((r) => [...r, 1].join(",")).join("\n") + "\n1,2,3\n";
    const r = await checkBatch(chunks(text), P);
    expect(r.status).toBe("checked");
    const codes = r.findings.map((f) => f.code);
    expect(codes).toContain("header.duplicate");
    expect(r.findings.find((f) => f.code === "row.ragged")?.rows).toEqual([7]);
  });
});
