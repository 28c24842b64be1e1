/**
 * Formula-safe CSV cells: the one definition every export uses (lib/format re-exports csvCell),
 * and the test the rewriter uses to keep a corrected cell as safe as the original.
 */

import { plainNumber } from "../format-number";

/**
 * Characters that make a spreadsheet read a cell as a formula: = + - @ TAB CR (OWASP,
 * "CSV Injection", owasp.org/www-community/attacks/CSV_Injection) and NUL (OWASP ASVS 5.0
 * V1.2.10).
 */
const FORMULA_START = /^[=+\-@\t\r\0]/;
/** A plain decimal number, as sent in a file ("-3.2", "+5", "-1,5", "2e-3"): no formula can hide in it. */
const PLAIN_NUMBER = /^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$/;
/** Quoted: RFC 4180's comma, quote and line breaks, and the semicolon and tab that spreadsheets in other locales split on. */
const NEEDS_QUOTES = /[",;\t\r\n]/;

/** True when a spreadsheet cannot read the text as a formula. */
export function formulaSafe(s: string): boolean {
  return !FORMULA_START.test(s) || PLAIN_NUMBER.test(s);
}

/**
 * One CSV field, safe to open in a spreadsheet — the one function every export uses
 * (server downloads and the browser's table download). Text that starts like a formula
 * gets a leading apostrophe so the spreadsheet shows it as text (OWASP CSV Injection);
 * numbers, and text that is a plain number such as "-3.2", stay numbers. Fields with a
 * comma, quote, line break, semicolon or tab are quoted with doubled quotes (RFC 4180
 * §2.6–2.7), so a spreadsheet splitting on ";" cannot start a new cell inside one.
 */
export function csvCell(value: unknown): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return plainNumber(value);
  if (typeof value === "boolean") return value ? "true" : "false";
  let s = value instanceof Date ? value.toISOString() : String(value);
  if (!formulaSafe(s)) s = `'${s}`;
  return NEEDS_QUOTES.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}
