/**
 * Display formatting shared by pages and tables: numbers, dates, batch states, roles,
 * and CSV cells that are safe to open in a spreadsheet.
 */
import type { BatchState, UserRole } from "@/db/schema";

const intFmt = new Intl.NumberFormat("en-GB", { maximumFractionDigits: 0 });

/** 12345 → "12,345"; null/undefined → "–". */
export function formatCount(n: number | null | undefined): string {
  return n === null || n === undefined || !Number.isFinite(n) ? "–" : intFmt.format(n);
}

/** A number with a fixed count of decimals, "–" when absent. */
export function formatDecimal(n: number | null | undefined, digits = 2): string {
  if (n === null || n === undefined || !Number.isFinite(n)) return "–";
  return n.toLocaleString("en-GB", { minimumFractionDigits: digits, maximumFractionDigits: digits });
}

/** Bytes as B / KB / MB / GB with one decimal (1 KB = 1024 B). */
export function formatBytes(n: number | null | undefined): string {
  if (n === null || n === undefined || !Number.isFinite(n)) return "–";
  const units = ["B", "KB", "MB", "GB"];
  let v = n;
  let u = 0;
  while (v >= 1024 && u < units.length - 1) {
    v /= 1024;
    u++;
  }
  return u === 0 ? `${v} B` : `${v.toFixed(1)} ${units[u]}`;
}

const dateTimeFmt = new Intl.DateTimeFormat("en-GB", {
  day: "numeric",
  month: "short",
  year: "numeric",
  hour: "2-digit",
  minute: "2-digit",
  timeZone: "UTC",
});
const dateFmt = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", year: "numeric", timeZone: "UTC" });

function toDate(d: Date | string | number | null | undefined): Date | null {
  if (d === null || d === undefined) return null;
  const x = d instanceof Date ? d : new Date(d);
  return Number.isNaN(x.getTime()) ? null : x;
}

/** "1 Dec 2026, 22:43 UTC" — always UTC so server and browser agree. */
export function formatDateTime(d: Date | string | number | null | undefined): string {
  const x = toDate(d);
  return x ? `${dateTimeFmt.format(x)} UTC` : "–";
}

/** "1 Dec 2026". */
export function formatDate(d: Date | string | number | null | undefined): string {
  const x = toDate(d);
  return x ? dateFmt.format(x) : "–";
}

/** ISO 8601 in UTC, for CSV and machine-readable attributes. */
export function isoDateTime(d: Date | string | number | null | undefined): string {
  const x = toDate(d);
  return x ? x.toISOString() : "";
}

export const BATCH_STATE_LABELS: Record<BatchState, string> = {
  received: "Received",
  checking: "Checking",
  ready: "Ready for review",
  accepted: "Accepted",
  bounced: "Bounced",
  superseded: "Superseded",
  unreadable: "Unreadable",
};

export function batchStateLabel(s: string): string {
  return (BATCH_STATE_LABELS as Record<string, string>)[s] ?? s;
}

export const ROLE_LABELS: Record<UserRole, string> = {
  provider: "Data provider",
  analyst: "Analyst",
  lead: "Lead",
  admin: "Administrator",
};

export function roleLabel(r: string): string {
  return (ROLE_LABELS as Record<string, string>)[r] ?? r;
}

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
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  if (typeof value === "boolean") return value ? "true" : "false";
  let s = value instanceof Date ? value.toISOString() : String(value);
  if (FORMULA_START.test(s) && !PLAIN_NUMBER.test(s)) s = `'${s}`;
  return NEEDS_QUOTES.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** A whole CSV document (CRLF line ends, RFC 4180) from a header row and data rows. */
export function toCsv(header: readonly string[], rows: readonly (readonly unknown[])[]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(",")).join("\r\n") + "\r\n";
}
