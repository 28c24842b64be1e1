/**
 * BlockText (lib/readiness/fields.ts), the text of a block's fields for the check's string path:
 * past its first fields it decodes an ASCII block a window at a time and slices fields from the
 * window. Every field it gives must be the field's own text (TextDecoder over its bytes, the
 * WHATWG Encoding Standard's UTF-8 decoder) whichever order the fields are asked in, for short
 * fields, fields longer than a window, fields across a window's end, and non-ASCII blocks.
 */
import { describe, expect, test } from "vitest";
import { BlockText } from "@/lib/readiness/fields";
import { rng } from "../fixtures/engine/data";

const utf8 = new TextDecoder("utf-8");
const enc = new TextEncoder();

/** A block of random fields (lengths up to `maxLen`), with the [start, end) of each. */
function block(seed: number, fields: number, maxLen: number, nonAscii: boolean) {
  const r = rng(seed);
  const parts: string[] = [];
  const spans: [number, number][] = [];
  let at = 3; // the block starts inside a larger buffer
  for (let i = 0; i < fields; i++) {
    const len = r() < 0.05 ? Math.floor(r() * maxLen) : Math.floor(r() * 40);
    let s = "";
    for (let k = 0; k < len; k++) s += String.fromCharCode(97 + Math.floor(r() * 26));
    if (nonAscii && i === fields >> 1) s += "é–ß";
    const bytes = enc.encode(s).length;
    spans.push([at, at + bytes]);
    parts.push(s);
    at += bytes + 1;
  }
  const buf = enc.encode("xyz" + parts.join(",") + ",tail");
  return { buf, spans, from: 3, to: at - 1 };
}

describe("BlockText gives each field's own text", () => {
  for (const [seed, nonAscii] of [
    [1, false],
    [2, false],
    [3, true],
  ] as const) {
    test(`seed ${seed}${nonAscii ? ", a non-ASCII block" : ""}: in order, again, backwards and at random`, () => {
      // 6,000 fields with some up to 100,000 bytes: several windows, and fields longer than one
      const { buf, spans, from, to } = block(seed, 6000, 100_000, nonAscii);
      expect(to - from).toBeGreaterThan(4 * (1 << 16));
      const want = spans.map(([s, e]) => utf8.decode(buf.subarray(s, e)));
      const t = new BlockText();
      const r = rng(seed + 100);
      const orders = [
        spans.map((_, i) => i),
        spans.map((_, i) => i),
        spans.map((_, i) => spans.length - 1 - i),
        spans.map(() => Math.floor(r() * spans.length)),
      ];
      for (const order of orders) {
        t.reset(buf, from, to);
        for (const i of order) expect(t.get(spans[i]![0], spans[i]![1])).toBe(want[i]);
      }
    });
  }
});
