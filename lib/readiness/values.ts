/**
 * Reading single values: numbers (with decimal-comma detection), booleans, dates, and the
 * folding used to spot level spelling variants.
 */

const DECIMAL_COMMA = /^[+-]?(\d{1,3}(\.\d{3})+|\d+),\d+$|^[+-]?\d+,\d+([eE][+-]?\d+)?$/;

/**
 * Whether t is a plain decimal number: [+-] digits [. digits] [e [+-] digits], with at least one
 * digit before the exponent. One pass over the characters (a regular expression with nested
 * digit runs backtracks quadratically on a long run of digits that ends in something else).
 */
function isPlainNumber(t: string): boolean {
  const n = t.length;
  let i = 0;
  let c = t.charCodeAt(0);
  if (c === 43 || c === 45) c = t.charCodeAt(++i);
  let mantissa = 0;
  while (c >= 48 && c <= 57) {
    mantissa++;
    c = t.charCodeAt(++i);
  }
  if (c === 46) {
    c = t.charCodeAt(++i);
    while (c >= 48 && c <= 57) {
      mantissa++;
      c = t.charCodeAt(++i);
    }
  }
  if (mantissa === 0) return false;
  if (c === 101 || c === 69) {
    c = t.charCodeAt(++i);
    if (c === 43 || c === 45) c = t.charCodeAt(++i);
    let exp = 0;
    while (c >= 48 && c <= 57) {
      exp++;
      c = t.charCodeAt(++i);
    }
    if (exp === 0) return false;
  }
  return i === n;
}

/**
 * Parse a number written with a decimal point; NaN when it is not one, or when it is too large
 * to be a finite double (`1e999`, a run of 400 digits). Leading and trailing spaces are
 * allowed; hex, `Infinity` and thousands separators are not.
 */
export const POW10 = [
  1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19,
  1e20, 1e21, 1e22,
];

export function readNumber(s: string): number {
  const n = s.length;
  if (n === 0) return NaN;
  // Fast path for plain decimals ([-]digits[.digits], at most 15 digits): the digits as an
  // exact integer divided by an exact power of ten is correctly rounded (Clinger 1990), so
  // the result is the same double as Number(s).
  if (n <= 16) {
    let i = 0;
    let neg = false;
    if (s.charCodeAt(0) === 45) {
      neg = true;
      i = 1;
    }
    let m = 0;
    let digitsSeen = 0;
    let frac = -1;
    for (; i < n; i++) {
      const c = s.charCodeAt(i);
      if (c >= 48 && c <= 57) {
        m = m * 10 + (c - 48);
        digitsSeen++;
        if (frac >= 0) frac++;
      } else if (c === 46 && frac < 0) frac = 0;
      else break;
    }
    if (i === n && digitsSeen > 0 && digitsSeen <= 15) {
      const v = frac > 0 ? m / POW10[frac]! : m;
      return neg ? -v : v;
    }
  }
  const c0 = s.charCodeAt(0);
  const cl = s.charCodeAt(n - 1);
  // fast path: starts with a digit/sign/point, ends with a digit, not 0x/0b/0o
  if (((c0 >= 48 && c0 <= 57) || c0 === 45 || c0 === 43 || c0 === 46) && cl >= 48 && cl <= 57) {
    if (!(c0 === 48 && n > 2 && s.charCodeAt(1) > 57)) {
      const v = +s;
      if (v === v) return v - v === 0 ? v : NaN;
    }
  }
  const t = s.trim();
  if (t.length === 0 || !isPlainNumber(t)) return NaN;
  const v = +t;
  return Number.isFinite(v) ? v : NaN;
}

/** A number written with a decimal comma (`12,5`, `1.234,5`) → its value; NaN otherwise. */
export function readDecimalComma(s: string): number {
  const t = s.trim();
  if (!DECIMAL_COMMA.test(t)) return NaN;
  const c = +t.replace(/\./g, "").replace(",", ".");
  return Number.isFinite(c) ? c : NaN;
}

const TRUE = new Set(["true", "yes", "y", "t", "1"]);
const FALSE = new Set(["false", "no", "n", "f", "0"]);

/** Parse a boolean: true/false, yes/no, y/n, t/f, 1/0 (any case) → 1 / 0; null otherwise. */
export function parseBoolean(s: string): 0 | 1 | null {
  const t = s.trim().toLowerCase();
  if (TRUE.has(t)) return 1;
  if (FALSE.has(t)) return 0;
  return null;
}

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})([T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})?)?$/;
const DMY_LIKE = /^(\d{1,2})[/.-](\d{1,2})[/.-](\d{2}|\d{4})$/;

export type DateParse = { kind: "iso" } | { kind: "pair"; a: number; b: number } | { kind: "bad" };
const ISO_OK: DateParse = { kind: "iso" };
const BAD: DateParse = { kind: "bad" };

/** The decimal number written in s[from, to) with digits only; −1 otherwise. */
function digits(s: string, from: number, to: number): number {
  let v = 0;
  for (let i = from; i < to; i++) {
    const c = s.charCodeAt(i) - 48;
    if (c < 0 || c > 9) return -1;
    v = v * 10 + c;
  }
  return v;
}

export function validYmd(y: number, m: number, d: number): boolean {
  if (m < 1 || m > 12 || d < 1) return false;
  const days = [
    31,
    (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0 ? 29 : 28,
    31,
    30,
    31,
    30,
    31,
    31,
    30,
    31,
    30,
    31,
  ][m - 1]!;
  return d <= days;
}

/**
 * Classify a date: ISO 8601 (unambiguous), or `a/b/yyyy` where the day/month order depends on
 * the column (the caller decides from all values, or from the plan's dateFormat).
 */
export function parseDate(s: string): DateParse {
  if (s.length === 10 && s.charCodeAt(4) === 45 && s.charCodeAt(7) === 45) {
    const y = digits(s, 0, 4);
    const m = digits(s, 5, 7);
    const d = digits(s, 8, 10);
    if (y >= 0 && m >= 0 && d >= 0) return validYmd(y, m, d) ? ISO_OK : BAD;
  }
  const t = s.trim();
  const iso = ISO_DATE.exec(t);
  if (iso) return validYmd(+iso[1]!, +iso[2]!, +iso[3]!) ? { kind: "iso" } : { kind: "bad" };
  const p = DMY_LIKE.exec(t);
  if (p) {
    const a = +p[1]!;
    const b = +p[2]!;
    if ((a >= 1 && a <= 31 && b >= 1 && b <= 12) || (b >= 1 && b <= 31 && a >= 1 && a <= 12))
      return { kind: "pair", a, b };
  }
  return { kind: "bad" };
}

/** Trim, lower-case and strip accents: `Clay `, `clay` and `Cláy` fold to the same key. */
export function foldLevel(s: string): string {
  return s
    .trim()
    .toLowerCase()
    .normalize("NFD")
    .replace(/[\u0300-\u036f]/g, "")
    .replace(/\s+/g, " ");
}

/** True when a and b are at most one edit (insert, delete or substitute) apart. */
export function oneEditApart(a: string, b: string): boolean {
  if (a === b) return true;
  const la = a.length;
  const lb = b.length;
  if (Math.abs(la - lb) > 1) return false;
  let i = 0;
  while (i < la && i < lb && a[i] === b[i]) i++;
  if (la === lb) return a.slice(i + 1) === b.slice(i + 1);
  return la > lb ? a.slice(i + 1) === b.slice(i) : a.slice(i) === b.slice(i + 1);
}
