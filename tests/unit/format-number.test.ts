/**
 * The number formatter by table: value, purpose, expected text.
 *
 * Sources beside the values: the float artefacts are the IEEE 754 doubles nearest to the
 * decimals a reader expects (5.005000000000001 is what 5.005 looks like after arithmetic; the
 * issue saw it in the columns table); "< 0.001" for small p-values follows the APA Publication
 * Manual (7th ed., §6.36: exact p to two or three decimals, p < .001 below that) — common
 * practice; thousands separators and the space before "%" follow the house style of the pages
 * (en-GB grouping, "15 %").
 */
import { describe, expect, test } from "vitest";
import {
  countOf,
  formatNumber,
  niceTicks,
  plainNumber,
  type NumberPurpose,
} from "@/lib/readiness/format-number";

const TABLE: [value: number | null, purpose: NumberPurpose, expected: string][] = [
  // measures in the data's units: artefacts gone, the data's own decimals kept
  [5.005000000000001, "measure", "5.005"],
  [253.04999999999998, "measure", "253.05"],
  [3.1950000000000003, "measure", "3.195"],
  [0.1 + 0.2, "measure", "0.3"],
  [12000.5, "measure", "12,000.5"],
  [-999, "measure", "-999"],
  [0, "measure", "0"],
  // estimates: 4 significant digits, never fewer than the whole part
  [6.41234, "estimate", "6.412"],
  [0.012345, "estimate", "0.01235"],
  [12345.678, "estimate", "12,346"],
  [999.96, "estimate", "1,000"],
  [-2.5, "estimate", "-2.5"],
  [-0, "estimate", "0"],
  [0.0000123456, "estimate", "1.235 × 10⁻⁵"],
  // statistics: 3 significant digits
  [5.2741, "statistic", "5.27"],
  [134.567, "statistic", "135"],
  [0.93456, "statistic", "0.935"],
  [1234.5, "statistic", "1,235"],
  // p-values: 2 significant digits, "< 0.001" below 0.001 (APA, common practice)
  [0.0467, "pvalue", "0.047"],
  [0.5, "pvalue", "0.5"],
  [0.001, "pvalue", "0.001"],
  [0.00099, "pvalue", "< 0.001"],
  [0, "pvalue", "< 0.001"],
  [1, "pvalue", "1"],
  // percentages of a fraction
  [0.1234, "percent", "12 %"],
  [0.0345, "percent", "3.5 %"],
  [0.0001, "percent", "< 0.1 %"],
  [0.99999, "percent", "> 99.9 %"],
  [1, "percent", "100 %"],
  [0, "percent", "0 %"],
  // counts
  [1234567, "count", "1,234,567"],
  [1, "count", "1"],
  // absent
  [null, "estimate", "–"],
  [Number.NaN, "count", "–"],
];

describe("formatNumber", () => {
  test.each(TABLE)("%s as %s → %s", (value, purpose, expected) => {
    expect(formatNumber(value, purpose)).toBe(expected);
  });
});

describe("countOf", () => {
  test.each([
    [1, "parameter", undefined, "1 parameter"],
    [2, "parameter", undefined, "2 parameters"],
    [0, "row", undefined, "0 rows"],
    [1204, "row", undefined, "1,204 rows"],
    [1, "batch", "batches", "1 batch"],
    [3, "batch", "batches", "3 batches"],
  ] as const)("%s %s", (n, singular, plural, expected) => {
    expect(countOf(n, singular, plural)).toBe(expected);
  });
});

describe("plainNumber (CSV cells)", () => {
  test.each([
    [253.04999999999998, "253.05"],
    [5.005000000000001, "5.005"],
    [0.1 + 0.2, "0.3"],
    [-0, "0"],
    [1e-7, "1e-7"],
    [123456789, "123456789"],
  ])("%s → %s", (value, expected) => {
    expect(plainNumber(value)).toBe(expected);
  });
});

describe("niceTicks (chart axes)", () => {
  test.each([
    [0, 37, 5, false, [0, 10, 20, 30, 40]],
    [0, 0.3, 5, false, [0, 0.1, 0.2, 0.3]],
    [0, 1000, 5, false, [0, 250, 500, 750, 1000]],
    [0, 3, 5, true, [0, 1, 2, 3]],
    [0, 0, 5, true, [0, 1, 2, 3, 4]],
  ] as const)("%s to %s, about %s ticks (integer %s)", (min, max, count, integer, expected) => {
    const ticks = niceTicks(min, max, count, integer);
    expect(ticks).toEqual(expected);
    // distinct once printed, and free of float artefacts
    const labels = ticks.map((t) => formatNumber(t, "estimate"));
    expect(new Set(labels).size).toBe(labels.length);
  });
});
