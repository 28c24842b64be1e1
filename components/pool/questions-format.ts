/** Number formats of the pool questions' figures (tables, charts and their labels alike). */
import { formatDecimal } from "@/lib/format";

/** A p-value: four decimals, or "< 0.0001" below that (a tiny p says no more than that). */
export function formatP(p: number | null | undefined): string {
  if (p === null || p === undefined || !Number.isFinite(p)) return "–";
  return p < 1e-4 ? "< 0.0001" : formatDecimal(p, 4);
}

/** "p = 0.0123" or "p < 0.0001", for a sentence. */
export function pIs(p: number | null | undefined): string {
  const s = formatP(p);
  return s.startsWith("<") ? `p ${s}` : `p = ${s}`;
}

/** A test statistic or criterion: two decimals, or three significant digits in e-notation when huge. */
export function formatStat(x: number | null | undefined, digits = 2): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "–";
  return Math.abs(x) >= 1e6 ? x.toExponential(2) : formatDecimal(x, digits);
}

/** Degrees of freedom as "(df1, df2)". */
export const formatDf = (df1: number, df2: number) => `(${df1}, ${df2})`;

/** A share as a whole per cent. */
export const formatShare = (x: number | null | undefined) =>
  x === null || x === undefined ? "–" : `${Math.round(x * 100)} %`;

/** Raw values for sorting and CSV: rounded so a download shows what the table shows. */
export const rounded = (x: number | null | undefined, digits = 4) =>
  x === null || x === undefined || !Number.isFinite(x) ? null : Number(x.toFixed(digits));
