/**
 * Fault: the app and the worker are restarted while jobs are in flight. Batches come in
 * through the app's upload API (POST /api/v1/batches, in-process) and wait in the queue in
 * MariaDB; a real worker process holds one of them mid-file when it gets SIGTERM. It stops
 * claiming, gives the check its grace period, then hands the job back to the queue without
 * using up an attempt and exits 0. A new worker process completes every job: one report
 * each, nothing lost. A check that ends within the grace period is finished, not dropped.
 */
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, inArray } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { batchVersions, batches, checkJobs, users } from "@/db/schema";
import { parseUploadToken, startUploadFake, type UploadFake } from "@/fakes/upload-service";
import { POST } from "@/app/api/v1/batches/route";
import { BARLEY_HEADER, barleyRows, toCsv } from "@/lib/demo/batches";
import { createApiToken } from "@/lib/people/commands-tokens";
import {
  clearOutbox,
  killAllWorkers,
  outcome,
  startWorker,
  waitFor,
  type WorkerProcess,
} from "./helpers/faults";
import { startFileGate, type FileGate } from "./helpers/faults-net";
import { drainQueue } from "./helpers/pipeline";
import { PROCESS_PATIENCE_MS, processTestTimeout } from "../helpers/processes";

const token = process.env.UPLOADTHING_TOKEN!;
let dir = "";
let fake: UploadFake;
let gate: FileGate;
let apiToken = "";
let second: WorkerProcess | undefined;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-faults-restart-"));
  fake = await startUploadFake({ port: 0, apiKey: parseUploadToken(token).apiKey, dir, log: () => {} });
  gate = await startFileGate(fake.url);
  // the app's upload client reads these at first use
  process.env.UPLOADTHING_API_URL = fake.url;
  process.env.UPLOADTHING_INGEST_URL = fake.url;
  await drainQueue();
  await clearOutbox(getDb());
  const [u] = await getDb()
    .select({ id: users.id })
    .from(users)
    .where(eq(users.email, "provider@harrowgate.test"));
  const t = await createApiToken(u!.id, { name: "restart fault test" });
  if (!t.ok) throw new Error(t.message);
  apiToken = t.data.token;
});

afterAll(async () => {
  await killAllWorkers();
  await gate?.close();
  await fake?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
  await getPool().end();
});

function workerEnv(graceMs: number): Record<string, string> {
  return {
    DATABASE_URL: process.env.DATABASE_URL!,
    UPLOADTHING_API_URL: fake.url,
    UPLOADTHING_INGEST_URL: fake.url,
    UPLOADTHING_UFS_HOST: `localhost:${gate.port}`,
    TRIBUTARY_WORKER_STOP_GRACE_MS: String(graceMs),
  };
}

/** Uploads a batch of `rows` rows through the app's API; returns its version id and size. */
async function upload(
  rows: number,
  seed: number,
): Promise<{ versionId: number; size: number; rows: number }> {
  const csv = toCsv(BARLEY_HEADER, barleyRows(`R${seed}`, rows, seed));
  const form = new FormData();
  form.append("study", "barley-nitrogen");
  form.append("file", new File([csv], `season-${seed}.csv`, { type: "text/csv" }));
  const res = await POST(
    new Request("http://127.0.0.1:3410/api/v1/batches", {
      method: "POST",
      headers: { authorization: `Bearer ${apiToken}` },
      body: form,
    }),
    { params: Promise.resolve({}) },
  );
  expect(res.status).toBe(201);
  const body = (await res.json()) as { data: { batchId: string; state: string } };
  expect(body.data.state).toBe("received");
  const [v] = await getDb()
    .select({ id: batchVersions.id })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .where(and(eq(batches.publicId, body.data.batchId), eq(batchVersions.version, 1)));
  return { versionId: v!.id, size: Buffer.byteLength(csv), rows };
}

const jobsOf = (versionIds: number[]) =>
  getDb().select().from(checkJobs).where(inArray(checkJobs.batchVersionId, versionIds));

describe("the worker restarted with jobs in flight", () => {
  it(
    "a SIGTERM hands the check in hand back uncounted; after the restart every job ends with one report",
    { timeout: processTestTimeout(4) },
    async () => {
      const inFlight = [await upload(40_000, 11), await upload(8_000, 12), await upload(8_000, 13)];
      const held = gate.holdNext(Math.floor(inFlight[0]!.size * 0.4));
      const first = startWorker(workerEnv(500));
      await held;
      const [running] = await jobsOf([inFlight[0]!.versionId]);
      expect(running).toMatchObject({ status: "running", attempts: 1 });
      expect(running!.lockedBy).toContain(`:${first.pid}:`);
      expect((await jobsOf([inFlight[1]!.versionId, inFlight[2]!.versionId])).map((j) => j.status)).toEqual([
        "queued",
        "queued",
      ]);

      first.kill("SIGTERM");
      expect(await first.exited).toEqual({ code: 0, signal: null });
      await first.waitForLine(
        new RegExp(`check job ${running!.id} handed back to the queue \\(attempt not counted\\)`),
      );
      await first.waitForLine(/\[worker\] stopped/);
      const [back] = await jobsOf([inFlight[0]!.versionId]);
      expect(back).toMatchObject({ status: "queued", attempts: 0, lockedBy: null });
      expect((await outcome(getDb(), [inFlight[0]!.versionId])).get(inFlight[0]!.versionId)).toMatchObject({
        state: "received",
        reports: [],
      });

      // the app takes another batch while no worker runs; then the new worker starts
      const whileDown = await upload(8_000, 14);
      const all = [...inFlight, whileDown];
      second = startWorker(workerEnv(60_000));
      const ids = all.map((b) => b.versionId);
      await waitFor(
        "every job to be done after the restart",
        async () => (await jobsOf(ids)).every((j) => j.status === "done"),
        PROCESS_PATIENCE_MS,
        250,
      );

      const o = await outcome(getDb(), ids);
      for (const b of all) {
        const r = o.get(b.versionId)!;
        expect(r.reports, `version ${b.versionId}: exactly one report`).toHaveLength(1);
        expect(Number(r.reports[0]!.rows)).toBe(b.rows);
        expect(r.state).toBe("ready");
        expect(r.audit).toEqual(["batch.checked", "batch.received"]);
        // one attempt each: the stop did not use one up
        expect(r.jobs.map((j) => [j.status, j.attempts, j.lockedBy?.includes(`:${second!.pid}:`)])).toEqual([
          ["done", 1, true],
        ]);
      }
    },
  );

  it(
    "a check that ends within the grace period is finished before the worker stops",
    { timeout: processTestTimeout(4) },
    async () => {
      const w = second!;
      const b = await upload(20_000, 15);
      const held = gate.holdNext(Math.floor(b.size * 0.4));
      await held;
      const [job] = await jobsOf([b.versionId]);
      expect(job).toMatchObject({ status: "running", attempts: 1 });
      w.kill("SIGTERM");
      await w.waitForLine(/SIGTERM: no new jobs/);
      gate.release();
      expect(await w.exited).toEqual({ code: 0, signal: null });
      await w.waitForLine(new RegExp(`check job ${job!.id} done: report stored \\(20000 rows\\)`));
      const r = (await outcome(getDb(), [b.versionId])).get(b.versionId)!;
      expect(r.reports).toHaveLength(1);
      expect(r.state).toBe("ready");
      expect(r.jobs.map((j) => [j.status, j.attempts])).toEqual([["done", 1]]);
    },
  );
});
