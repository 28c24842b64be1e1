/** Small statistics for the board: quantiles and calendar weeks. */

/**
 * Sample quantile by linear interpolation between order statistics, Hyndman & Fan (1996)
 * type 7 (R's default `quantile(x, p)`): h = (n − 1)p, Q = x₍⌊h⌋₎ + (h − ⌊h⌋)(x₍⌊h⌋+1₎ − x₍⌊h⌋₎)
 * with 0-based order statistics. Null for an empty sample.
 */
export function quantile(values: readonly number[], p: number): number | null {
  if (!values.length) return null;
  const xs = [...values].sort((a, b) => a - b);
  const h = (xs.length - 1) * p;
  const lo = Math.floor(h);
  const a = xs[lo]!;
  const b = xs[Math.min(lo + 1, xs.length - 1)]!;
  return a + (h - lo) * (b - a);
}

/** Monday 00:00 UTC of the ISO week holding `d`. */
export function weekStart(d: Date): Date {
  const day = (d.getUTCDay() + 6) % 7; // Monday = 0
  return new Date(Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate() - day));
}

export const HOUR_MS = 3_600_000;
