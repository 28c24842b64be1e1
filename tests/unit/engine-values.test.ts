/**
 * Value readers and streaming accumulators against their definitions: number parsing equals
 * ECMAScript Number() on plain decimals; quartiles by selection equal R's type-7 quantile on the
 * sorted values (R: quantile(c(1, 2, 3, 4, 10)) = 2, 3, 4); the sample beyond its bound stays
 * within a few standard errors; pooled moments equal one pass (Chan et al. 1979).
 */
import { describe, expect, test } from "vitest";
import {
  Moments,
  QuantileStore,
  linePriority,
  quantile,
  selectQuantile,
  selectRanks,
} from "@/lib/readiness/accumulators";
import { foldLevel, oneEditApart, parseDate, readDecimalComma, readNumber } from "@/lib/readiness/values";
import { rng } from "../fixtures/engine/data";

describe("readNumber", () => {
  test("equals Number() on 20,000 random plain decimals", () => {
    const r = rng(99);
    for (let i = 0; i < 20_000; i++) {
      const digits = 1 + Math.floor(r() * 15);
      let s = "";
      for (let d = 0; d < digits; d++) s += Math.floor(r() * 10);
      const point = Math.floor(r() * (digits + 1));
      if (point < digits && r() < 0.7) s = `${s.slice(0, point) || "0"}.${s.slice(point)}`;
      if (r() < 0.3) s = `-${s}`;
      expect(Object.is(readNumber(s), Number(s)), s).toBe(true);
    }
  });
  test.each([
    ["1e3", 1000],
    [" 12.5 ", 12.5],
    ["+4", 4],
    ["1234567890123456789", 1234567890123456789],
    ["0x1F", NaN],
    ["Infinity", NaN],
    ["12,5", NaN],
    ["1.2.3", NaN],
    ["-", NaN],
  ])("%s → %s", (s, v) => expect(readNumber(s)).toBe(v));
  test.each([
    ["12,5", 12.5],
    ["1.234,5", 1234.5],
    ["-0,25", -0.25],
    ["12.5", NaN],
  ])("decimal comma %s → %s", (s, v) => expect(readDecimalComma(s)).toBe(v));
});

describe("dates and level folding", () => {
  test.each([
    ["2026-04-30", "iso"],
    ["2026-02-30", "bad"],
    ["2024-02-29", "iso"],
    ["03/04/2026", "pair"],
    ["31/12/2026", "pair"],
    ["13/13/2026", "bad"],
  ])("%s is %s", (s, kind) => expect(parseDate(s).kind).toBe(kind));
  test("folding and one edit", () => {
    expect(foldLevel(" Cláy ")).toBe("clay");
    expect(oneEditApart("amberlea", "amberleaa")).toBe(true);
    expect(oneEditApart("amberlea", "ambrlea")).toBe(true);
    expect(oneEditApart("amberlea", "amberlee")).toBe(true);
    expect(oneEditApart("loam", "sand")).toBe(false);
  });
});

describe("quartiles", () => {
  test("selection equals type-7 quantiles of the sorted values", () => {
    expect([0.25, 0.5, 0.75].map((p) => selectQuantile(Float64Array.from([10, 4, 1, 3, 2]), p))).toEqual([
      2, 3, 4,
    ]);
    const r = rng(5);
    for (let n = 1; n < 300; n += 7) {
      const v = Float64Array.from({ length: n }, () => Math.round(r() * 50));
      const sorted = v.slice().sort();
      for (const p of [0.25, 0.5, 0.75])
        expect(selectQuantile(v.slice(), p)).toBeCloseTo(quantile(sorted, p), 12);
    }
  });
  test("several order statistics at once are each where a sort puts them, ties and all", () => {
    const r = rng(21);
    for (let t = 0; t < 300; t++) {
      const n = 1 + Math.floor(r() * 3000);
      // few distinct values now and then: long runs equal to the pivot
      const spread = t % 3 === 0 ? 4 : 1e6;
      const v = Float64Array.from({ length: n }, () => Math.floor(r() * spread) - spread / 2);
      const ranks = [...new Set(Array.from({ length: 1 + Math.floor(r() * 40) }, () => Math.floor(r() * n)))];
      ranks.sort((a, b) => a - b);
      const a = v.slice();
      selectRanks(a, ranks);
      const sorted = v.slice().sort();
      for (const k of ranks) expect(a[k], `n ${n}, rank ${k}`).toBe(sorted[k]);
      expect(a.slice().sort()).toEqual(sorted);
    }
  });
  test("beyond the bound the sample's quartiles of U(0,1) are within 5 standard errors", () => {
    const q = new QuantileStore(2000);
    const r = rng(8);
    for (let i = 0; i < 200_000; i++) q.add(r(), i + 2);
    expect(q.exact).toBe(false);
    const [q1, med, q3] = q.quantiles([0.25, 0.5, 0.75]) as [number, number, number];
    // SE of a sample quantile of U(0,1): √(p(1−p)/m)
    expect(Math.abs(q1 - 0.25)).toBeLessThan(5 * Math.sqrt(0.1875 / 2000));
    expect(Math.abs(med - 0.5)).toBeLessThan(5 * Math.sqrt(0.25 / 2000));
    expect(Math.abs(q3 - 0.75)).toBeLessThan(5 * Math.sqrt(0.1875 / 2000));
  });
  test("the sample beyond the bound is the same set however the file is cut into parts", () => {
    const r = rng(11);
    const xs = Array.from({ length: 30_000 }, () => r());
    const one = new QuantileStore(2000);
    xs.forEach((x, i) => one.add(x, i + 2));
    for (const cuts of [[1], [1999, 2001], [7000, 15_000, 29_999], [100, 200, 300]]) {
      const parts = [0, ...cuts, xs.length].slice(1).map(() => new QuantileStore(2000));
      const bounds = [0, ...cuts, xs.length];
      parts.forEach((q, p) => {
        for (let i = bounds[p]!; i < bounds[p + 1]!; i++) q.add(xs[i]!, i + 2);
      });
      const merged = parts[0]!;
      for (const q of parts.slice(1)) merged.absorb(q.part());
      expect(merged.seen).toBe(30_000);
      expect(merged.exact).toBe(false);
      expect(Array.from(merged.sorted())).toEqual(Array.from(one.sorted()));
      expect(merged.quantiles([0.25, 0.5, 0.75])).toEqual(one.quantiles([0.25, 0.5, 0.75]));
      expect(merged.sample(512)).toEqual(one.sample(512));
    }
  });
  test("the sample is the values of the rows of smallest priority (a brute-force bottom-k)", () => {
    const r = rng(13);
    const xs = Array.from({ length: 20_000 }, () => r());
    const q = new QuantileStore(1500);
    xs.forEach((x, i) => q.add(x, i + 2));
    const expected = xs
      .map((x, i) => [linePriority(i + 2), x] as const)
      .sort((a, b) => a[0] - b[0])
      .slice(0, 1500)
      .map(([, x]) => x)
      .sort((a, b) => a - b);
    expect(Array.from(q.sorted())).toEqual(expected);
    // a bijection: no two rows share a priority
    expect(new Set(Array.from({ length: 100_000 }, (_, i) => linePriority(i))).size).toBe(100_000);
  });
  test("within the bound every value is kept, in file order, however the file is cut", () => {
    const one = new QuantileStore(2000);
    const a = new QuantileStore(2000);
    const b = new QuantileStore(2000);
    for (let i = 0; i < 1500; i++) {
      one.add(i % 97, i + 2);
      (i < 600 ? a : b).add(i % 97, i + 2);
    }
    a.absorb(b.part());
    expect(a.exact).toBe(true);
    expect(a.sample(5000)).toEqual(Array.from({ length: 1500 }, (_, i) => i % 97));
    expect(a.sample(512)).toEqual(one.sample(512));
  });
  test("merged moments equal one pass", () => {
    const r = rng(3);
    const xs = Array.from({ length: 1000 }, () => 1e6 + r());
    const all = new Moments();
    const a = new Moments();
    const b = new Moments();
    xs.forEach((x, i) => (all.add(x), (i < 300 ? a : b).add(x)));
    a.merge(b.toJSON());
    expect(a.mean).toBeCloseTo(all.mean, 8);
    expect(a.sd / all.sd).toBeCloseTo(1, 9);
    expect([a.min, a.max, a.n]).toEqual([all.min, all.max, 1000]);
  });
});
