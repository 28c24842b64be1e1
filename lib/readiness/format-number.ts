/**
 * The one way Tributary prints a number (pages, e-mails, CSV downloads, the engine's messages
 * and its CLI): the digits follow the number's purpose and magnitude, never the binary float
 * (5.005000000000001 prints as 5.005). Plain module, no framework: the engine imports it too.
 *
 * Purposes
 * - count: whole things, with thousands separators ("12,345").
 * - measure: a value in the data's own units (min, quartiles, max): up to 6 significant digits,
 *   trailing zeros dropped ("253.05").
 * - estimate: a fitted or summary quantity (mean, sd, coefficient, R², rows per parameter):
 *   4 significant digits, never fewer than the whole part ("6.412", "1,235").
 * - statistic: a test statistic or index (F, χ², VIF, condition index, r): 3 significant digits.
 * - pvalue: 2 significant digits, and "< 0.001" below 0.001 (common practice in reporting).
 * - percent: a fraction shown as a percentage: 1 decimal under 10 %, whole above; "< 0.1 %"
 *   for a small non-zero share and "> 99.9 %" for one just short of all.
 */
export type NumberPurpose = "count" | "measure" | "estimate" | "statistic" | "pvalue" | "percent";

const DASH = "–";
const SIGNIFICANT: Record<"measure" | "estimate" | "statistic", number> = {
  measure: 6,
  estimate: 4,
  statistic: 3,
};
const SUPERSCRIPT: Record<string, string> = {
  "-": "⁻",
  "0": "⁰",
  "1": "¹",
  "2": "²",
  "3": "³",
  "4": "⁴",
  "5": "⁵",
  "6": "⁶",
  "7": "⁷",
  "8": "⁸",
  "9": "⁹",
};

/** "12345.5" → "12,345.5": thousands separators on the whole part of a plain decimal string. */
function group(plain: string): string {
  const neg = plain.startsWith("-");
  const body = neg ? plain.slice(1) : plain;
  const [whole = "0", frac] = body.split(".");
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return `${neg ? "-" : ""}${grouped}${frac ? `.${frac}` : ""}`;
}

/** Drops trailing zeros after the decimal point ("5.0050" → "5.005", "3.00" → "3"). */
function trimZeros(s: string): string {
  return s.includes(".") ? s.replace(/\.?0+$/, "") : s;
}

/** "1.2 × 10⁻⁵": scientific notation for the very small and very large. */
function scientific(x: number, digits: number): string {
  const [mant = "0", exp = "0"] = x.toExponential(Math.max(0, digits - 1)).split("e");
  const e = String(Number(exp))
    .split("")
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join("");
  return `${trimZeros(mant)} × 10${e}`;
}

/** x rounded to `digits` significant digits (never fewer than its whole part), as a plain grouped decimal. */
function significant(x: number, digits: number): string {
  const abs = Math.abs(x);
  if (abs === 0) return "0";
  if (abs < 1e-4 || abs >= 1e15) return scientific(x, digits);
  // the decimal exponent from the string, not from Math.log10 (log10(1000) is 2.9999999999999996)
  const magnitude = Number(abs.toExponential().split("e")[1]);
  const decimals = Math.max(0, digits - 1 - magnitude);
  const rounded = Number(x.toPrecision(Math.max(digits, magnitude + 1)));
  return group(trimZeros(rounded.toFixed(decimals)));
}

function percent(fraction: number): string {
  const p = fraction * 100;
  if (p === 0) return "0 %";
  if (p > 0 && p < 0.05) return "< 0.1 %";
  if (p < 100 && p >= 99.95) return "> 99.9 %";
  const abs = Math.abs(p);
  return `${group(abs < 10 ? trimZeros(p.toFixed(1)) : p.toFixed(0))} %`;
}

/** A number for people to read, by purpose (see the module's comment); "–" when absent. */
export function formatNumber(x: number | null | undefined, purpose: NumberPurpose): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return DASH;
  const v = Object.is(x, -0) ? 0 : x;
  switch (purpose) {
    case "count":
      return group(Math.round(v).toFixed(0));
    case "pvalue":
      return v < 0.001 ? "< 0.001" : String(Number(v.toPrecision(2)));
    case "percent":
      return percent(v);
    default: {
      const out = significant(v, SIGNIFICANT[purpose]);
      return out === "-0" ? "0" : out;
    }
  }
}

/** "1 parameter", "2 parameters", "1,204 rows": a count with its noun, singular or plural. */
export function countOf(n: number, singular: string, plural = `${singular}s`): string {
  return `${formatNumber(n, "count")} ${Math.round(n) === 1 ? singular : plural}`;
}

/**
 * A number for a machine (CSV cells, JSON shown as text): the shortest decimal that round-trips
 * after rounding to 12 significant digits, so 253.04999999999998 is written as 253.05.
 */
export function plainNumber(x: number): string {
  if (!Number.isFinite(x)) return "";
  const v = Number(x.toPrecision(12));
  return String(Object.is(v, -0) ? 0 : v);
}

/**
 * Axis ticks from `min` to `max`: about `count` distinct, evenly spaced round values (steps of
 * 1, 2, 2.5 or 5 times a power of ten; whole steps when `integer`), free of float artefacts.
 */
export function niceTicks(min: number, max: number, count = 5, integer = false): number[] {
  if (!Number.isFinite(min) || !Number.isFinite(max)) return [];
  if (max < min) [min, max] = [max, min];
  if (max === min) max = min + (integer ? Math.max(1, count - 1) : 1);
  const raw = (max - min) / Math.max(1, count - 1);
  const mag = 10 ** Math.floor(Math.log10(raw));
  let step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  if (integer) step = Math.max(1, Math.ceil(step));
  const first = Math.floor(min / step) * step;
  const ticks: number[] = [];
  for (let t = first; t <= max + step * 1e-9; t += step) ticks.push(Number(t.toPrecision(12)));
  if (ticks[ticks.length - 1]! < max) ticks.push(Number((ticks[ticks.length - 1]! + step).toPrecision(12)));
  return ticks;
}

/** "= 0.047" or "< 0.001": a p-value after "p", so a small one never reads as "p = 0.000". */
export function pEquals(p: number | null | undefined): string {
  const s = formatNumber(p, "pvalue");
  return s.startsWith("<") ? s : `= ${s}`;
}

/** "R² ≥ 0.123", or "even R² < 0.001" when the test is sensitive below the third decimal (never "≥ 0.000"). */
export function detectableR2(r2: number): string {
  return r2 < 0.001 ? "even R² < 0.001" : `R² ≥ ${formatNumber(r2, "estimate")}`;
}
