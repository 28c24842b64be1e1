/**
 * Upload names made safe (lib/batches/intake/file-rules.ts): the stored name is the last path
 * segment without control, bidi-override (Unicode TR #9 explicit formatting characters) or
 * zero-width characters, Windows-reserved characters replaced, at most 200 characters with
 * the extension kept; and the download header follows RFC 6266 §4.3 (an ASCII `filename`
 * and the UTF-8 `filename*` of RFC 8187, whose value uses attr-chars and %-escapes only).
 */
import { describe, expect, test } from "vitest";
import {
  attachmentDisposition,
  cleanFileName,
  cleanText,
  MAX_FILE_NAME_CHARS,
} from "@/lib/batches/intake/file-rules";

const CASES: [string, string][] = [
  ["../../etc/passwd.csv", "passwd.csv"],
  ["..\\..\\x.csv", "x.csv"],
  ["C:\\Users\\me\\plots.csv", "plots.csv"],
  ["<img src=x onerror=alert(1)>.csv", "_img src=x onerror=alert(1)_.csv"],
  ["a\u0000b\u0007c\u009b.csv", "abc.csv"],
  ["invoice\u202Egpj.csv", "invoicegpj.csv"],
  ["\u2066iso\u2069late.csv", "isolate.csv"],
  ["zero\u200Bwidth\uFEFF.csv", "zerowidth.csv"],
  ["  plots  .csv  ", "plots.csv"],
  ["...hidden.csv", "hidden.csv"],
  ["", "batch.csv"],
  ["../..", "batch.csv"],
  ["NUL.csv", "_NUL.csv"],
  ["tab\tand\nnewline.csv", "tabandnewline.csv"],
  ["naïve café.csv", "naïve café.csv"],
  ["e\u0301.csv", "\u00e9.csv"],
];

describe("cleanFileName", () => {
  test.each(CASES)("%j → %j", (given, want) => {
    expect(cleanFileName(given)).toBe(want);
  });

  test.each(CASES.map(([g]) => [g]))("is idempotent on %j", (given) => {
    const once = cleanFileName(given);
    expect(cleanFileName(once)).toBe(once);
  });

  test("long names keep their extension within the limit, counted in characters (not UTF-16 units)", () => {
    expect(cleanFileName(`${"a".repeat(1000)}.csv`)).toBe(`${"a".repeat(MAX_FILE_NAME_CHARS - 4)}.csv`);
    const emoji = cleanFileName(`${"😀".repeat(500)}.tsv`);
    expect(Array.from(emoji)).toHaveLength(MAX_FILE_NAME_CHARS);
    expect(emoji.endsWith("😀.tsv")).toBe(true);
  });
});

describe("attachmentDisposition", () => {
  const ATTR_CHARS = /^[A-Za-z0-9!#$&+.^_`|~%-]*$/;

  test.each([
    ["plots.csv", "attachment; filename=\"plots.csv\"; filename*=UTF-8''plots.csv"],
    [
      "naïve café.csv",
      "attachment; filename=\"naive-cafe.csv\"; filename*=UTF-8''na%C3%AFve%20caf%C3%A9.csv",
    ],
    [
      'x";\r\nSet-Cookie: a=b.csv',
      "attachment; filename=\"x_-Set-Cookie_-a-b.csv\"; filename*=UTF-8''x_%3BSet-Cookie_%20a%3Db.csv",
    ],
    ["😀.csv", "attachment; filename=\"download.csv\"; filename*=UTF-8''%F0%9F%98%80.csv"],
  ])("%j", (name, want) => {
    expect(attachmentDisposition(name)).toBe(want);
  });

  test.each(CASES.map(([g]) => [g]))(
    "for %j: no break-out characters, and filename* decodes to the clean name",
    (given) => {
      const h = attachmentDisposition(given);
      expect(h).not.toMatch(/[\r\n\0]/);
      const m = /^attachment; filename="([^"\\]*)"; filename\*=UTF-8''(.*)$/.exec(h)!;
      expect(m[1]).toMatch(/^[A-Za-z0-9._-]+$/);
      expect(m[2]).toMatch(ATTR_CHARS);
      expect(decodeURIComponent(m[2]!)).toBe(cleanFileName(given));
    },
  );
});

test("cleanText removes control and bidi characters from a label and collapses spaces", () => {
  expect(cleanText("  spring\u202E plots\n\t2026\u0000 ")).toBe("spring plots 2026");
  expect(cleanText("<b>label</b>")).toBe("<b>label</b>");
});
