/**
 * The duplicate tables (lib/readiness/hashing.ts HashSet64): a merge of byte ranges keeps each
 * range's table and looks it up after the earlier ones' (chain) instead of adding every entry to
 * one grown table; both must answer every lookup alike: the line of an entry's first occurrence
 * in file order, and the number of distinct entries.
 */
import { describe, expect, test } from "vitest";
import { HashSet64 } from "@/lib/readiness/hashing";
import { rng } from "../fixtures/engine/data";

describe("sets of later parts looked up in turn equal one set holding them all", () => {
  test("three parts of random entries, a quarter of them repeated across parts", () => {
    const r = rng(41);
    const pool = Array.from({ length: 6000 }, () => [(r() * 2 ** 32) >>> 0, (r() * 2 ** 32) >>> 0] as const);
    let line = 2;
    const parts = [0, 1, 2].map(() => {
      const s = new HashSet64(1_000_000);
      // the first occurrence inside each part, as a range's scan keeps it
      for (let i = 0; i < 3000; i++) {
        const [a, b] = pool[Math.floor(r() * pool.length)]!;
        s.addOrGet(a, b, line++);
      }
      return s;
    });
    const one = new HashSet64(1_000_000);
    const chained = new HashSet64(1_000_000);
    parts[0]!.forEach((a, b, l) => {
      one.addOrGet(a, b, l);
      chained.addOrGet(a, b, l);
    });
    for (const p of parts.slice(1)) {
      let repeats = 0;
      p.forEach((a, b, l) => {
        if (one.addOrGet(a, b, l)) repeats++;
      });
      let seen = 0;
      p.forEach((a, b) => {
        if (chained.lineOf(a, b)) seen++;
      });
      expect(seen).toBe(repeats);
      chained.chain(p, repeats);
    }
    expect(chained.entries).toBe(one.size);
    for (const [a, b] of pool) expect(chained.lineOf(a, b)).toBe(one.lineOf(a, b));
    // adding to a chained set finds what its later parts hold
    const [a, b] = pool.find(
      ([x, y]) => parts[2]!.lineOf(x, y) && !parts[0]!.lineOf(x, y) && !parts[1]!.lineOf(x, y),
    )!;
    expect(chained.addOrGet(a, b, 99_999)).toBe(parts[2]!.lineOf(a, b));
    expect(chained.entries).toBe(one.size);
  });

  test("a table sized for the rows expected is that size, and finds every entry after growing", () => {
    const s = new HashSet64(1_000_000);
    // 5/3 slots per row expected (at most 60 % full), 12 bytes a slot, not rounded to a power of two
    s.reserve(300_000);
    expect(s.bytes).toBe(500_000 * 12);
    const r = rng(43);
    const keys = Array.from(
      { length: 700_000 },
      () => [(r() * 2 ** 32) >>> 0, (r() * 2 ** 32) >>> 0] as const,
    );
    let repeats = 0;
    keys.forEach(([a, b], i) => (repeats += s.addOrGet(a, b, i + 2) ? 1 : 0));
    expect(repeats).toBe(0);
    // grown past 60 % full: twice the slots
    expect(s.bytes).toBe(1_000_000 * 12 * 2);
    const wrong = keys.filter(([a, b], i) => s.lineOf(a, b) !== i + 2);
    expect(wrong).toEqual([]);
    expect(s.size).toBe(700_000);
  });
});
