/**
 * Mutation testing of the reader: a valid batch with random byte flips, stray quotes, NULs,
 * lone CRs, cut-offs, doubled delimiters, very long fields, a doubled BOM or a repeated header
 * always ends in a report — "checked" or "unreadable" — whose findings carry messages and
 * fixes; never a thrown error or a stack trace; memory stays bounded.
 */
import { describe, expect, test } from "vitest";
import { checkBatch } from "@/lib/readiness";
import { HEADER, chunks, cleanRows, csvOf, plan, rng } from "../fixtures/engine/data";

const P = plan();
const base = new TextEncoder().encode(csvOf(HEADER, cleanRows(400)));
const headerBytes = new TextEncoder().encode(HEADER.join(",") + "\n");

type Mutation = (b: Uint8Array, r: () => number) => Uint8Array;
const at = (b: Uint8Array, r: () => number) => Math.floor(r() * b.length);
const splice = (b: Uint8Array, i: number, del: number, ins: ArrayLike<number>) => {
  const out = new Uint8Array(b.length - del + ins.length);
  out.set(b.subarray(0, i));
  out.set(ins, i);
  out.set(b.subarray(i + del), i + ins.length);
  return out;
};

const MUTATIONS: [string, Mutation][] = [
  [
    "random byte flips",
    (b, r) => {
      const c = b.slice();
      for (let k = 0; k < 1 + Math.floor(r() * 8); k++) c[at(c, r)] = Math.floor(r() * 256);
      return c;
    },
  ],
  [
    "stray quotes",
    (b, r) => {
      let c = b;
      for (let k = 0; k < 1 + Math.floor(r() * 4); k++) c = splice(c, at(c, r), 0, [34]);
      return c;
    },
  ],
  ["a NUL byte", (b, r) => splice(b, at(b, r), 0, [0])],
  [
    "lone CRs",
    (b, r) => {
      let c = b;
      for (let k = 0; k < 1 + Math.floor(r() * 4); k++) c = splice(c, at(c, r), 0, [13]);
      return c;
    },
  ],
  ["cut off anywhere", (b, r) => b.slice(0, at(b, r))],
  [
    "doubled delimiters",
    (b, r) => {
      let c = b;
      for (let k = 0; k < 1 + Math.floor(r() * 6); k++) {
        const i = c.indexOf(44, at(c, r));
        if (i >= 0) c = splice(c, i, 0, [44]);
      }
      return c;
    },
  ],
  [
    "a very long field",
    (b, r) => {
      const i = b.indexOf(44, at(b, r));
      const long = new Uint8Array(200_000 + Math.floor(r() * 2_000_000)).fill(r() < 0.5 ? 55 : 97);
      return i < 0 ? b : splice(b, i + 1, 0, long);
    },
  ],
  [
    "a very long quoted field",
    (b, r) => {
      const i = b.indexOf(44, at(b, r));
      const long = new Uint8Array(500_000).fill(10);
      return i < 0 ? b : splice(b, i + 1, 0, [34, ...long, 34, 44]);
    },
  ],
  ["a doubled byte-order mark", (b) => splice(b, 0, 0, [0xef, 0xbb, 0xbf, 0xef, 0xbb, 0xbf])],
  [
    "a repeated header",
    (b, r) => {
      const i = b.indexOf(10, at(b, r));
      return i < 0 ? b : splice(b, i + 1, 0, headerBytes);
    },
  ],
  ["a truncated UTF-8 sequence", (b, r) => splice(b, at(b, r), 0, [0xe6, 0x9d])],
];

describe("mutated batches always end in a report", () => {
  test.each(MUTATIONS)(
    "%s: 40 mutants",
    async (_name, mutate) => {
      const r = rng(_name.length * 7919);
      for (let k = 0; k < 40; k++) {
        const bytes = mutate(base, r);
        const heap = process.memoryUsage().heapUsed;
        let peak = heap;
        const report = await checkBatch(chunks(bytes, 1 + Math.floor(r() * 70_000)), P, {
          onProgress: () => (peak = Math.max(peak, process.memoryUsage().heapUsed)),
        });
        peak = Math.max(peak, process.memoryUsage().heapUsed);
        expect(["checked", "unreadable"]).toContain(report.status);
        for (const f of report.findings) {
          expect(f.message.length).toBeGreaterThan(10);
          expect(f.fix.length).toBeGreaterThan(10);
          expect(f.message).not.toMatch(/\n\s+at |RangeError|TypeError|internal error/);
        }
        if (report.status === "unreadable")
          expect(report.findings.map((f) => f.code)).toEqual(["file.unreadable"]);
        // bounded: the reader holds one record and one block, whatever the input (generous bound)
        expect(peak - heap).toBeLessThan(256 << 20);
      }
    },
    120_000,
  );
});
