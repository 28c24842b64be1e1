/** Number formats of the pool questions' figures (tables, charts and their labels alike). */
import { formatNumber } from "@/lib/format";

/** A p-value as every page prints one (lib/format: two significant digits, "< 0.001" below that). */
export function formatP(p: number | null | undefined): string {
  return formatNumber(p ?? null, "pvalue");
}

/** "p = 0.012" or "p < 0.001", for a sentence. */
export function pIs(p: number | null | undefined): string {
  const s = formatP(p);
  return s.startsWith("<") ? `p ${s}` : `p = ${s}`;
}

/**
 * A test statistic or criterion (lib/format's "statistic": three significant digits), or with
 * `digits` of 3 or more a fitted quantity such as R² ("estimate": four significant digits).
 */
export function formatStat(x: number | null | undefined, digits = 2): string {
  return formatNumber(x ?? null, digits >= 3 ? "estimate" : "statistic");
}

/** Degrees of freedom as "(df1, df2)". */
export const formatDf = (df1: number, df2: number) => `(${df1}, ${df2})`;

/** A share as a whole per cent. */
export const formatShare = (x: number | null | undefined) => formatNumber(x ?? null, "percent");

/** Raw values for sorting and CSV: rounded so a download shows what the table shows. */
export const rounded = (x: number | null | undefined, digits = 4) =>
  x === null || x === undefined || !Number.isFinite(x) ? null : Number(x.toFixed(digits));
