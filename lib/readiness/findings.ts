/** Building findings and counting them. */
import type { FindingCode } from "./codes";
import type { Finding, Severity } from "./report";

export function finding(
  code: FindingCode,
  severity: Severity,
  columns: string[],
  message: string,
  fix: string,
  extra: { rows?: number[]; rowCount?: number; detail?: Record<string, unknown> } = {},
): Finding {
  const f: Finding = { code, severity, columns, rows: distinctSorted(extra.rows ?? []), message, fix };
  if (extra.rowCount !== undefined) f.rowCount = extra.rowCount;
  if (extra.detail) f.detail = extra.detail;
  return f;
}

/** Row numbers ascending, each once. */
export function distinctSorted(rows: readonly number[]): number[] {
  const out = [...new Set(rows)].sort((a, b) => a - b);
  return out;
}

/** The first `cap` distinct rows (ascending) of several row lists. */
export function sampleOf(lists: readonly (readonly number[])[], cap: number): number[] {
  return distinctSorted(lists.flat()).slice(0, cap);
}

const ORDER: Record<Severity, number> = { blocker: 0, warning: 1, note: 2 };

/** Blockers first, then warnings, then notes; stable within a severity. */
export function sortFindings(fs: Finding[]): Finding[] {
  return fs
    .map((f, i) => [f, i] as const)
    .sort((a, b) => ORDER[a[0].severity] - ORDER[b[0].severity] || a[1] - b[1])
    .map((p) => p[0]);
}

export function countFindings(fs: Finding[]): { blocker: number; warning: number; note: number } {
  const c = { blocker: 0, warning: 0, note: 0 };
  for (const f of fs) c[f.severity]++;
  return c;
}

export const pct = (x: number) => `${(100 * x).toFixed(x < 0.001 && x > 0 ? 2 : 1)} %`;
export const quote = (s: string) => `“${s}”`;
export const list = (xs: string[], max = 8) =>
  xs.length > max ? `${xs.slice(0, max).join(", ")} and ${xs.length - max} more` : xs.join(", ");

/** "1 row", "2 rows", "1,234 rows" */
export const rowsOf = (n: number) => `${n.toLocaleString("en")} row${n === 1 ? "" : "s"}`;
