/** Table columns the pool questions' tables share: a statistic, a list of terms, a count. */
import type { Column } from "@/components/data-table";
import { formatCount, formatNumber } from "@/lib/format";
import { formatStat, rounded } from "./questions-format";

/** A number column: sorted and downloaded rounded, shown with `digits` decimals ("fixed": never in e-notation). */
export function statColumn<T>(
  key: string,
  header: string,
  get: (r: T) => number | null | undefined,
  width: string,
  digits = 2,
  fixed = false,
): Column<T> {
  return {
    key,
    header,
    value: (r) => rounded(get(r), Math.max(digits, 4)),
    render: (r) => (fixed ? formatNumber(get(r) ?? null, "estimate") : formatStat(get(r), digits)),
    numeric: true,
    width,
  };
}

/** A whole-number column (rows, df). */
export function countColumn<T>(key: string, header: string, get: (r: T) => number, width: string): Column<T> {
  return { key, header, value: get, render: (r) => formatCount(get(r)), numeric: true, width };
}

/** A list of model terms in the code face; an empty list reads as the required terms alone. */
export function termsColumn<T>(
  key: string,
  header: string,
  get: (r: T) => string[],
  width = "minmax(14rem, 3fr)",
): Column<T> {
  return {
    key,
    header,
    value: (r) => get(r).join(", "),
    render: (r) => <span className="font-mono text-xs">{get(r).join(", ") || "(required terms only)"}</span>,
    width,
  };
}
