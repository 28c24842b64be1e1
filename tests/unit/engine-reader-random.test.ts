/**
 * Differential tests of the one reader (lib/readiness/tokenizer.ts via csvRecords): random CSV
 * files — quoted fields holding delimiters, doubled quotes and line breaks, CRLF / LF / CR, a
 * BOM, blank lines, ragged rows, comma / semicolon / tab — read by our reader, by papaparse and
 * by Python's csv module (the standard library's RFC 4180 reader) give the same records and
 * fields; the line each record starts on equals a count of the line breaks in the raw text
 * before it.
 */
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Papa from "papaparse";
import { describe, expect, test } from "vitest";
import { csvRecords } from "@/lib/readiness/records";
import { chunks, rng } from "../fixtures/engine/data";

interface RandomCsv {
  text: string;
  delimiter: string;
  newline: string;
  records: string[][];
  /** line on which each record starts: 1 + line breaks in the text before it */
  lines: number[];
}

const PIECES = ["a", "b", "z", "0", "7", ".", "-", " ", "é", "東", "🌾", "'", "x y"];

/** A random file with known records (every record with at least two fields, so none is blank). */
function randomCsv(seed: number): RandomCsv {
  const r = rng(seed);
  const pick = <T>(xs: T[]) => xs[Math.floor(r() * xs.length)]!;
  const delimiter = pick([",", ";", "\t"]);
  const newline = pick(["\n", "\r\n", "\r"]);
  const width = 2 + Math.floor(r() * 5);
  const field = (): { raw: string; value: string } => {
    const n = Math.floor(r() * 6);
    let v = "";
    for (let i = 0; i < n; i++) v += pick(PIECES);
    const special = r();
    if (special < 0.35) {
      // quoted, with what needs quoting inside
      const inner = v + pick([delimiter, '"', "\n", "\r\n", "", delimiter + '"']) + pick(PIECES);
      return { raw: `"${inner.replace(/"/g, '""')}"`, value: inner };
    }
    if (special < 0.4 && v.length > 0) return { raw: `${v}"${v}`, value: `${v}"${v}` }; // a stray quote inside
    return { raw: v, value: v };
  };
  const records: string[][] = [];
  const lines: number[] = [];
  let text = r() < 0.3 ? "\uFEFF" : "";
  const rows = 5 + Math.floor(r() * 40);
  for (let i = 0; i < rows; i++) {
    if (i > 0 && r() < 0.1) text += newline; // a blank line
    const w = r() < 0.1 ? width + pick([-1, 1, 2]) : width; // ragged
    const fs = Array.from({ length: Math.max(2, w) }, field);
    lines.push(1 + (text.match(/\r\n|\r|\n/g)?.length ?? 0));
    records.push(fs.map((f) => f.value));
    text += fs.map((f) => f.raw).join(delimiter);
    if (i < rows - 1 || r() < 0.7) text += newline;
  }
  return { text, delimiter, newline, records, lines };
}

async function ours(c: RandomCsv, chunk: number) {
  const records: string[][] = [];
  const lines: number[] = [];
  for await (const rec of csvRecords(chunks(c.text, chunk), { delimiter: c.delimiter })) {
    records.push(rec.fields);
    lines.push(rec.kind === "header" ? 1 : rec.line);
  }
  return { records, lines };
}

const FILES = Array.from({ length: 300 }, (_, i) => randomCsv(1000 + i));

describe("our reader, papaparse and Python's csv module read random files alike", () => {
  // the delimiter is given (the report's); sniffing it is tested with the hostile files
  test("300 files, read whole and in chunks of 1 and 7 bytes: the records and their line numbers are the generator's", async () => {
    for (const c of FILES) {
      // (a file that begins with a blank line would make the header line 2; the generator never does)
      for (const size of [1, 7, 1 << 16]) {
        const got = await ours(c, size);
        expect(got.records, c.text).toEqual(c.records);
        expect(got.lines, c.text).toEqual(c.lines);
      }
    }
  });

  test("papaparse gives the same records (files with one kind of line end)", () => {
    for (const c of FILES) {
      const body = c.text.replace(/^\uFEFF/, "");
      const p = Papa.parse<string[]>(body, {
        delimiter: c.delimiter,
        newline: c.newline as "\n",
        skipEmptyLines: true,
      });
      expect(p.data, c.text).toEqual(c.records);
    }
  });

  test("Python's csv module gives the same records and start lines", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tributary-csv-"));
    const args: string[] = [];
    FILES.forEach((c, i) => {
      const f = path.join(dir, `f${i}.csv`);
      fs.writeFileSync(f, c.text);
      args.push(f, c.delimiter);
    });
    const py = JSON.parse(
      execFileSync("python3", [path.resolve("tests/fixtures/engine/csv-records.py"), ...args], {
        maxBuffer: 64 << 20,
      }).toString(),
    ) as {
      records: string[][];
      lines: number[];
    }[];
    for (const [i, c] of FILES.entries()) {
      const got = await ours(c, 64);
      expect(got.records, c.text).toEqual(py[i]!.records);
      expect(got.lines, c.text).toEqual(py[i]!.lines);
    }
  });
});
