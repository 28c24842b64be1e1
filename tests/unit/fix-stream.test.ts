/**
 * The browser's streamed fixes (lib/client/workers/fix-stream.ts) on a web ReadableStream: the
 * corrected Blob is byte for byte what the engine's in-memory rewrite makes, while script
 * memory held at most HOLD bytes of output plus a chunk; a suspected sentinel (one repeated
 * value far outside the rest, CHECKS.md `number.sentinel`) is never blanked until the provider
 * confirms it, and the confirmation needs no second read.
 */
import { describe, expect, test } from "vitest";
import { applyFixesToBytes, checkBatch, type ReadinessReport } from "@/lib/readiness";
import { HOLD, correctedBlob, suspectedSentinels, tallyStream } from "@/lib/client/workers/fix-stream";
import { HEADER, chunks, cleanRows, plan, type Row } from "../fixtures/engine/data";

const enc = new TextEncoder();

function streamOf(bytes: Uint8Array, size: number): ReadableStream<Uint8Array> {
  let i = 0;
  return new ReadableStream({
    pull(c) {
      if (i >= bytes.length) return c.close();
      c.enqueue(bytes.slice(i, i + size));
      i += size;
    },
  });
}

/** Rows whose rainfall holds -9999 now and then (undeclared), and "Clay" for the planned clay. */
function batch(n: number): string {
  const rows = cleanRows(n, 5).map((r, i) => {
    const row: Row = [...r];
    if (row[2] === "clay" && i % 2) row[2] = "Clay";
    if (i % 25 === 4) row[6] = -9999;
    return row;
  });
  return [HEADER.join(","), ...rows.map((r) => r.join(","))].join("\r\n") + "\r\n";
}

describe("the corrected file, streamed in the browser", () => {
  test("the Blob equals the in-memory rewrite; a suspected sentinel waits for confirmation", async () => {
    const p = plan();
    const text = batch(400);
    const bytes = enc.encode(text);
    const report: ReadinessReport = await checkBatch(chunks(text, 997), p);
    const suspected = suspectedSentinels(report);
    expect(suspected).toEqual([{ column: "rainfall", value: -9999 }]);

    const tally = await tallyStream(streamOf(bytes, 1024), p, report);
    const unconfirmed = tally.proposals(report);
    expect(unconfirmed.some((x) => x.code === "number.sentinel")).toBe(false);
    const plain = await correctedBlob(streamOf(bytes, 1024), unconfirmed);
    const plainText = await plain.blob.text();
    expect(plainText.split("\r\n").filter((l) => l.includes(",-9999,")).length).toBe(
      text.split("\r\n").filter((l) => l.includes(",-9999,")).length,
    );

    const confirmed = tally.proposals(report, { confirmedSentinels: suspected });
    const sentinel = confirmed.find((x) => x.id === "number.sentinel:rainfall")!;
    expect(sentinel.cells).toBe(text.split("\r\n").filter((l) => l.includes(",-9999,")).length);
    const out = await correctedBlob(streamOf(bytes, 1024), confirmed);
    const want = await applyFixesToBytes(bytes, confirmed);
    expect(new Uint8Array(await out.blob.arrayBuffer())).toEqual(want.bytes);
    expect(out.changes).toEqual(want.changes);
    expect(await out.blob.text()).not.toContain(",-9999,");
  });

  test("script memory holds at most HOLD bytes of output and a chunk, not the file", async () => {
    const p = plan();
    const one = batch(400);
    const body = one.slice(one.indexOf("\r\n") + 2);
    const text = one + body.repeat(Math.ceil((2.5 * HOLD) / body.length));
    const bytes = enc.encode(text);
    const report = await checkBatch(chunks(text, 1 << 16), p);
    const tally = await tallyStream(streamOf(bytes, 1 << 16), p, report);
    const out = await correctedBlob(streamOf(bytes, 1 << 16), tally.proposals(report));
    expect(out.blob.size).toBeGreaterThan(2 * HOLD);
    expect(out.held).toBeLessThan(HOLD + (1 << 17));
  });
});
