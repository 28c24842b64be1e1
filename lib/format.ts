/**
 * Display formatting shared by pages and tables: numbers, dates, batch states, roles,
 * and CSV cells that are safe to open in a spreadsheet.
 */
import type { BatchState, UserRole } from "@/db/schema";
import { csvCell } from "@/lib/readiness";

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

/** One formula-safe CSV field: the engine's definition (lib/readiness/fixes/csv-cell.ts). */
export { csvCell };

/** A whole CSV document (CRLF line ends, RFC 4180) from a header row and data rows. */
export function toCsv(header: readonly string[], rows: readonly (readonly unknown[])[]): string {
  return [header, ...rows].map((r) => r.map(csvCell).join(",")).join("\r\n") + "\r\n";
}
