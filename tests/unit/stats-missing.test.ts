/** PatternMoments (Little's MCAR sufficient statistics): merging, JSON, memory bound, degenerate cases. */
import { describe, expect, it } from "vitest";
import { PatternMoments, littleMcar } from "@/lib/readiness/stats";

/** Deterministic PRNG (mulberry32) and standard normals (Box–Muller). */
function rng(seed: number) {
  let a = seed >>> 0;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = () => Math.sqrt(-2 * Math.log(1 - u())) * Math.cos(2 * Math.PI * u());
  return { u, normal };
}

describe("PatternMoments", () => {
  it("merges and round-trips; a single pattern has no MCAR test", () => {
    const g = rng(8);
    const rows = Array.from({ length: 300 }, () => {
      const a = g.normal();
      const b = a + g.normal();
      const c = g.normal() * 3 + 100;
      return [a, g.u() < 0.2 ? null : b, g.u() < 0.3 ? null : c];
    });
    const one = new PatternMoments(["a", "b", "c"]);
    const p1 = new PatternMoments(["a", "b", "c"]);
    const p2 = new PatternMoments(["a", "b", "c"]);
    rows.forEach((r, i) => {
      one.addRow(r);
      (i < 120 ? p1 : p2).addRow(r);
    });
    p1.merge(p2);
    const x = littleMcar(one);
    const y = littleMcar(PatternMoments.fromJSON(JSON.parse(JSON.stringify(p1.toJSON()))));
    expect(x).not.toBeNull();
    expect(Math.abs((x?.statistic as number) - (y?.statistic as number))).toBeLessThan(
      1e-8 * (x?.statistic as number),
    );
    expect(x?.df).toBe(y?.df);
    // a column never observed is left out: same test as without it
    const withEmpty = new PatternMoments(["a", "b", "c", "z"]);
    rows.forEach((r) => withEmpty.addRow([...r, null]));
    const z = littleMcar(withEmpty);
    expect(z?.df).toBe(x?.df);
    expect(Math.abs((z?.statistic as number) - (x?.statistic as number))).toBeLessThan(
      1e-9 * (x?.statistic as number),
    );
    expect(() =>
      PatternMoments.fromJSON({
        kind: "pattern-moments",
        version: 1,
        columns: ["a"],
        patterns: [{ observed: [3], count: 1, mean: [1], comoment: [0] }],
      }),
    ).toThrow(/wrong shape/);
    // memory bound: too many patterns drops the moments and the test, and says so
    const saved = PatternMoments.MAX_CELLS;
    try {
      PatternMoments.MAX_CELLS = 50;
      const small = new PatternMoments(["a", "b", "c"]);
      rows.forEach((r) => small.addRow(r));
      expect(small.overflowed).toBe(true);
      expect(littleMcar(small)).toBeNull();
      expect(PatternMoments.fromJSON(JSON.parse(JSON.stringify(small.toJSON()))).overflowed).toBe(true);
      const fine = new PatternMoments(["a", "b", "c"]);
      fine.merge(small);
      expect(fine.overflowed).toBe(true);
    } finally {
      PatternMoments.MAX_CELLS = saved;
    }
    const complete = new PatternMoments(["a", "b"]);
    complete.addRow([1, 2]);
    complete.addRow([2, 5]);
    expect(littleMcar(complete)).toBeNull();
  });
});
