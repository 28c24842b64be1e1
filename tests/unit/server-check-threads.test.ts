/**
 * The server's check of a stored batch (lib/batches/jobs/proposals.ts): the check and the fix
 * tally read one download at the same time — the check on kept worker threads (RangePool,
 * lib/readiness/node.ts), the tally on the job's own thread — and give exactly what the check
 * and then the tally, one after the other on one thread, give.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, test } from "vitest";
import { checkBatch, proposeFixes, type ReadinessReport } from "@/lib/readiness";
import { RangePool, checkFile } from "@/lib/readiness/node";
import {
  keptThreadCount,
  rangeWorkerScript,
  spoolStream,
  warmCheckThreads,
} from "@/lib/readiness/node-stream";
import { checkAndPropose } from "@/lib/batches/jobs/proposals";
import { close } from "../helpers/close";
import { HEADER, chunks, cleanRows, csvOf, plan, type Row } from "../fixtures/engine/data";

const P = plan();
const strip = ({ state: _s, timings: _t, ...rest }: ReadinessReport) => rest;
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tributary-server-check-"));
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** A batch with fixable cells: a level in another case, a missing-value token, a quoted line break. */
function batch(n: number): string {
  const rows = cleanRows(n, 7).map((r, i): Row => {
    const row: Row = [...r];
    if (row[2] === "clay" && i % 3 === 0) row[2] = "Clay";
    if (i % 40 === 5) row[4] = "NA";
    if (i % 500 === 9) row[1] = '"two\nlines"';
    return row;
  });
  return csvOf(HEADER, rows);
}

describe("kept range threads", () => {
  test("a pool's threads are used again and give the report one pass gives, check after check", async () => {
    const text = batch(4000);
    const file = path.join(dir, "batch.csv");
    fs.writeFileSync(file, text);
    const one = strip(await checkBatch(chunks(text, 1 << 16), P));
    const pool = new RangePool(await rangeWorkerScript());
    try {
      for (let round = 0; round < 3; round++) {
        const par = await checkFile(file, P, { workers: 2, minBytes: 0, threadsOnly: true, pool });
        // numbers to 1e-9 relative (the merged factor's floating-point order), as the parallel tests compare
        close(strip(par), one, "report");
        // every range went to a thread of the pool, which kept them for the next check
        expect(pool.idleThreads).toBe(2);
      }
    } finally {
      await pool.close();
    }
    expect(pool.idleThreads).toBe(0);
  });
});

describe("one download, read by more than one reader (spoolStream)", () => {
  const bytesOf = async (it: AsyncIterable<Uint8Array>) => {
    const parts: Uint8Array[] = [];
    for await (const c of it) parts.push(c);
    return Buffer.concat(parts).toString("utf8");
  };

  test("under the limit it is held in memory; from the limit on it is a private file, removed after", async () => {
    const text = batch(1500);
    const held = await spoolStream(chunks(text, 3000), 1 << 30);
    expect(held.file).toBeNull();
    expect(held.size).toBe(Buffer.byteLength(text));
    expect(await bytesOf(held.read())).toBe(text);
    expect(await bytesOf(held.read())).toBe(text);
    const spooled = await spoolStream(chunks(text, 3000), 10_000);
    expect(spooled.file).not.toBeNull();
    expect(fs.statSync(spooled.file!).mode & 0o777).toBe(0o600);
    expect(fs.readFileSync(spooled.file!, "utf8")).toBe(text);
    expect(await bytesOf(spooled.read())).toBe(text);
    // a reader told to stop ends early, without an error
    const stop = new AbortController();
    let seen = 0;
    for await (const c of spooled.read(stop.signal)) {
      seen += c.length;
      stop.abort();
    }
    expect(seen).toBeGreaterThan(0);
    expect(seen).toBeLessThan(spooled.size);
    await spooled.remove();
    expect(fs.existsSync(path.dirname(spooled.file!))).toBe(false);
  });

  test("a download that fails past the limit rejects and leaves no file behind", async () => {
    const text = batch(1500);
    const before = fs.readdirSync(os.tmpdir()).filter((n) => n.startsWith("tributary-check-"));
    async function* failing(): AsyncGenerator<Uint8Array> {
      yield* chunks(text, 4096);
      throw new Error("the download stopped");
    }
    await expect(spoolStream(failing(), 10_000)).rejects.toThrow("the download stopped");
    const after = fs.readdirSync(os.tmpdir()).filter((n) => n.startsWith("tributary-check-"));
    expect(after.filter((n) => !before.includes(n))).toEqual([]);
  });
});

describe("the check and the fix tally, from one download at the same time", () => {
  const job = (lines: string[]) => ({ log: (l: string) => lines.push(l), jobId: 1 });

  test("threads started ahead (a worker process at its start) are the ones the first check takes", async () => {
    // the first test here to use the process's kept threads: none wait yet
    expect(keptThreadCount()).toBe(0);
    await warmCheckThreads(1); // one thread is no check on threads: nothing starts
    expect(keptThreadCount()).toBe(0);
    await warmCheckThreads(2);
    expect(keptThreadCount()).toBe(2);
    const both = await checkAndPropose(chunks(batch(4000), 3000), P, {
      workers: 2,
      minBytes: 0,
      job: job([]),
    });
    expect(both.status).toBe("checked");
    // a check that started threads of its own would hand them back too: more would wait now
    expect(keptThreadCount()).toBe(2);
  });

  test("the same report and proposals as the check, then the tally, on one thread", async () => {
    const text = batch(4000);
    const alone = await checkBatch(chunks(text, 1 << 16), P);
    const proposals = await proposeFixes(chunks(text, 1 << 16), P, alone);
    expect(proposals.map((p) => p.code)).toEqual(expect.arrayContaining(["level.variant", "missing.token"]));
    for (const minBytes of [0, 1 << 30]) {
      // minBytes 0: spooled and checked on worker threads; 1 GiB: read as it arrives, on this thread
      const lines: string[] = [];
      const both = await checkAndPropose(chunks(text, 3000), P, { workers: 2, minBytes, job: job(lines) });
      close(strip(both), { ...strip(alone), proposals }, "report");
      expect(both.proposals).toEqual(proposals);
      expect(lines).toEqual([]);
      // spooled (the first): its ranges were read by the process's two kept threads, which now wait
      // for the next check; read as it arrives (the second): no thread taken, none started
      expect(keptThreadCount()).toBe(2);
    }
  });

  test("a large batch whose check on two threads ends before the tally: the proposals count every row", async () => {
    // 200,000 rows (about 20 MB): the threads may check it faster than this thread tallies it, so a
    // tally stopped when the check ends (as in fa1f3b6 until this test) proposed fixes from part of the file
    const text = batch(200_000);
    const alone = await checkBatch(chunks(text, 1 << 16), P);
    const proposals = await proposeFixes(chunks(text, 1 << 16), P, alone);
    const both = await checkAndPropose(chunks(text, 1 << 16), P, { workers: 2, minBytes: 0, job: job([]) });
    expect(both.status).toBe("checked");
    expect(both.proposals).toEqual(proposals);
  }, 120_000);

  test("a download that fails rejects the check, and no tally is left waiting", async () => {
    const text = batch(2000);
    async function* failing(): AsyncGenerator<Uint8Array> {
      yield* chunks(text.slice(0, 20_000), 4096);
      throw new Error("the download stopped");
    }
    for (const minBytes of [0, 1 << 30])
      await expect(checkAndPropose(failing(), P, { workers: 2, minBytes, job: job([]) })).rejects.toThrow(
        "the download stopped",
      );
  });
});
