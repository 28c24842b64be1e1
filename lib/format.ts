/**
 * Display formatting shared by pages, e-mails, CSV downloads and the CLI: numbers (by purpose,
 * lib/readiness/format-number.ts), durations, dates, batch states, roles, and CSV cells that are safe to
 * open in a spreadsheet. Print no number any other way.
 */
import type { BatchState, UserRole } from "@/db/schema";
import { csvCell, formatNumber } from "@/lib/readiness";

export {
  countOf,
  detectableR2,
  formatNumber,
  niceTicks,
  pEquals,
  plainNumber,
  type NumberPurpose,
} from "@/lib/readiness";

/** 12345 → "12,345"; null/undefined → "–" (formatNumber's "count"). */
export function formatCount(n: number | null | undefined): string {
  return formatNumber(n, "count");
}

/**
 * "3 d 4 h", "5 h", "25 min": how long something has waited, in words a lead reads at a
 * glance (hours under 10 with one decimal).
 */
export function formatHours(h: number | null | undefined): string {
  if (h === null || h === undefined || !Number.isFinite(h)) return "–";
  if (h < 1) return `${formatNumber(h * 60, "count")} min`;
  if (h < 48)
    return `${h < 10 ? formatNumber(Math.round(h * 10) / 10, "measure") : formatNumber(h, "count")} h`;
  const d = Math.floor(h / 24);
  return `${d} d ${Math.round(h - d * 24)} h`;
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
  return u === 0
    ? `${formatNumber(v, "count")} B`
    : `${formatNumber(Math.round(v * 10) / 10, "measure")} ${units[u]}`;
}

const dateTimeFmt = new Intl.DateTimeFormat("en-GB", {
  day: "numeric",
  month: "short",
  year: "numeric",
  hour: "2-digit",
  minute: "2-digit",
  timeZone: "UTC",
});
const dateFmt = new Intl.DateTimeFormat("en-GB", {
  day: "numeric",
  month: "short",
  year: "numeric",
  timeZone: "UTC",
});

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

/**
 * The time in the viewer's zone (the browser's own, or `timeZone` when given), named by its short
 * zone: "2 Dec 2026, 11:43 GMT+13"; `dateOnly` drops the time. For the browser: a page rendered
 * on the server prints `formatDateTime` (UTC) and the client swaps this in (components/ui/local-time.tsx).
 */
export function formatLocalDateTime(
  d: Date | string | number | null | undefined,
  opts: { dateOnly?: boolean; timeZone?: string } = {},
): string {
  const x = toDate(d);
  if (!x) return "–";
  const fmt = new Intl.DateTimeFormat("en-GB", {
    day: "numeric",
    month: "short",
    year: "numeric",
    ...(opts.dateOnly ? {} : { hour: "2-digit", minute: "2-digit", timeZoneName: "short" }),
    timeZone: opts.timeZone,
  });
  return fmt.format(x);
}

/** "2026-12-01T22:43:00Z": ISO 8601 in UTC to the second, for a timestamp's hover text. */
export function isoSeconds(d: Date | string | number | null | undefined): string {
  const x = toDate(d);
  return x ? x.toISOString().replace(/\.\d{3}Z$/, "Z") : "";
}

/** ISO 8601 in UTC, for CSV and machine-readable attributes. */
export function isoDateTime(d: Date | string | number | null | undefined): string {
  const x = toDate(d);
  return x ? x.toISOString() : "";
}

export const BATCH_STATE_LABELS: Record<BatchState, string> = {
  received: "Received",
  checking: "Checking",
  ready: "Awaiting review",
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
