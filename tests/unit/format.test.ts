import { describe, expect, test } from "vitest";
import { csvCell, formatBytes, formatCount, toCsv } from "@/lib/format";

describe("csvCell", () => {
  // OWASP "CSV Injection": cells starting with = + - @ TAB or CR are neutralised with a leading apostrophe
  test.each([
    ["=SUM(A1:A9)", "'=SUM(A1:A9)"],
    ["+1+1", "'+1+1"],
    ["-2+3", "'-2+3"],
    ["@cmd", "'@cmd"],
    ["\tx", '"\'\tx"'],
    ["\rx", '"\'\rx"'],
    ["plain", "plain"],
    ["a=b", "a=b"],
  ])("%j → %j", (input, expected) => {
    expect(csvCell(input)).toBe(expected);
  });

  // RFC 4180 §2.6–2.7: fields with comma, quote or line break are quoted, quotes doubled
  test.each([
    ["a,b", '"a,b"'],
    ['say "hi"', '"say ""hi"""'],
    ["two\nlines", '"two\nlines"'],
    ['=HYPERLINK("x")', `"'=HYPERLINK(""x"")"`],
  ])("quotes %j", (input, expected) => {
    expect(csvCell(input)).toBe(expected);
  });

  test("numbers stay numbers, even negative ones; empty values are empty", () => {
    expect(csvCell(-3.5)).toBe("-3.5");
    expect(csvCell(null)).toBe("");
    expect(csvCell(undefined)).toBe("");
    expect(csvCell(Number.NaN)).toBe("");
    expect(csvCell(new Date(Date.UTC(2026, 0, 2, 3, 4, 5)))).toBe("2026-01-02T03:04:05.000Z");
  });
});

test("toCsv writes CRLF-terminated records (RFC 4180 §2.1)", () => {
  expect(
    toCsv(
      ["name", "n"],
      [
        ["x,y", 1],
        ["=1", null],
      ],
    ),
  ).toBe('name,n\r\n"x,y",1\r\n\'=1,\r\n');
});

test("formatCount and formatBytes", () => {
  expect(formatCount(1234567)).toBe("1,234,567");
  expect(formatCount(null)).toBe("–");
  expect(formatBytes(512)).toBe("512 B");
  expect(formatBytes(1536)).toBe("1.5 KB");
  // one decimal at most, and none when it is zero (lib/readiness/format-number.ts: no trailing zeros)
  expect(formatBytes(200 * 1024 * 1024)).toBe("200 MB");
});
