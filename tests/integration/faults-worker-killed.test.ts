/**
 * Fault: the worker is killed (SIGKILL) while it streams a large batch. Two real worker
 * processes run; the one holding the job is killed mid-file (its download held by a gate in
 * front of the upload fake, so "mid-file" is certain). While it lived, its heartbeats kept
 * the other worker off the job; once they stop, the other worker takes the job over after
 * the stale timeout and stores exactly one report. The dead worker's attempt stays counted
 * (a worker killed by a file must not retry that file forever).
 */
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { checkJobs, studies, users } from "@/db/schema";
import { parseUploadToken, startUploadFake, type UploadFake } from "@/fakes/upload-service";
import { BARLEY_HEADER, barleyRows, toCsv } from "@/lib/demo/batches";
import { recordBatchVersion } from "@/lib/batches/commands-upload";
import {
  clearOutbox,
  killAllWorkers,
  outcome,
  startWorker,
  waitFor,
  type WorkerProcess,
} from "./helpers/faults";
import { startFileGate, storeFile, type FileGate } from "./helpers/faults-net";
import { drainQueue } from "./helpers/pipeline";
import { processTestTimeout } from "../helpers/processes";

const ROWS = 60_000;
const STALE_MS = 2_000;
const STALL_MS = 6_000;
const token = process.env.UPLOADTHING_TOKEN!;
let dir = "";
let fake: UploadFake;
let gate: FileGate;
let survivor: WorkerProcess | undefined;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-faults-kill-"));
  fake = await startUploadFake({ port: 0, apiKey: parseUploadToken(token).apiKey, dir, log: () => {} });
  gate = await startFileGate(fake.url);
  await drainQueue();
  await clearOutbox(getDb());
});

afterAll(async () => {
  await killAllWorkers();
  await gate?.close();
  await fake?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
  await getPool().end();
});

function workerEnv(): Record<string, string> {
  return {
    DATABASE_URL: process.env.DATABASE_URL!,
    UPLOADTHING_API_URL: fake.url,
    UPLOADTHING_INGEST_URL: fake.url,
    // downloads go through the gate (the SDK signs URLs for this host)
    UPLOADTHING_UFS_HOST: `localhost:${gate.port}`,
    TRIBUTARY_JOB_STALE_MS: String(STALE_MS),
    // longer than the stall below, which heartbeats must bridge
    TRIBUTARY_JOB_STALL_MS: String(STALL_MS),
  };
}

async function queueLarge(seed: number, name: string): Promise<{ versionId: number; size: number }> {
  const db = getDb();
  const [provider] = await db
    .select({ id: users.id })
    .from(users)
    .where(eq(users.email, "provider@harrowgate.test"));
  const [study] = await db
    .select({ id: studies.id })
    .from(studies)
    .where(eq(studies.slug, "barley-nitrogen"));
  const file = await storeFile(fake.url, token, toCsv(BARLEY_HEADER, barleyRows("KL", ROWS, seed)), name);
  const recorded = await recordBatchVersion(
    provider!.id,
    { studyId: study!.id, title: "Large season file" },
    file,
  );
  if (!recorded.ok) throw new Error(recorded.message);
  return { versionId: recorded.data.batchVersionId, size: file.size };
}

describe("a worker killed mid-file", () => {
  it(
    "the job is taken over by another worker after the stale timeout and ends with exactly one report",
    { timeout: processTestTimeout(4) },
    async () => {
      const db = getDb();
      const { versionId, size } = await queueLarge(707, "harrowgate-large.csv");

      const heldAt = Math.floor(size * 0.4);
      const held = gate.holdNext(heldAt);
      const workers: WorkerProcess[] = [startWorker(workerEnv()), startWorker(workerEnv())];
      await held;

      const job = await waitFor("the job to be running", async () => {
        const [j] = await db.select().from(checkJobs).where(eq(checkJobs.batchVersionId, versionId));
        return j?.status === "running" && j.lockedBy ? j : null;
      });
      const victim = workers.find((w) => job.lockedBy!.includes(`:${w.pid}:`));
      survivor = workers.find((w) => w !== victim);
      expect(victim, `the job is locked by one of our workers (${job.lockedBy})`).toBeDefined();
      expect(job.attempts).toBe(1);

      // alive but stalled mid-file for longer than the stale timeout: heartbeats keep the claim
      await new Promise((r) => setTimeout(r, STALE_MS * 2));
      const [still] = await db.select().from(checkJobs).where(eq(checkJobs.id, job.id));
      expect(still).toMatchObject({ status: "running", lockedBy: job.lockedBy, attempts: 1 });
      expect(still!.heartbeatAt!.getTime()).toBeGreaterThan(job.heartbeatAt!.getTime());
      const [mid] = await outcome(db, [versionId]).then((m) => [...m.values()]);
      expect(mid!.state).toBe("checking");
      expect(mid!.reports).toHaveLength(0);

      const killedAt = Date.now();
      victim!.kill("SIGKILL");
      expect(await victim!.exited).toEqual({ code: null, signal: "SIGKILL" });

      const done = await waitFor("the job to be done by the other worker", async () => {
        const [j] = await db.select().from(checkJobs).where(eq(checkJobs.id, job.id));
        return j?.status === "done" ? j : null;
      });
      const tookOver = Date.now() - killedAt;
      expect(tookOver).toBeGreaterThanOrEqual(STALE_MS - 1_000);
      expect(done.lockedBy).not.toBe(job.lockedBy);
      expect(done.lockedBy).toContain(`:${survivor!.pid}:`);
      expect(done.attempts).toBe(2);
      // the killed attempt's one download, then the survivor's one: the check and the report's
      // fix proposals read the same download (lib/batches/jobs/proposals.ts)
      expect(gate.downloads).toBe(2);

      const o = (await outcome(db, [versionId])).get(versionId)!;
      expect(o.reports).toHaveLength(1);
      expect(o.reports[0]).toMatchObject({ status: "checked" });
      expect(Number(o.reports[0]!.rows)).toBe(ROWS);
      expect(o.state).toBe("ready");
      expect(o.audit).toEqual(["batch.checked", "batch.received"]);
      expect(survivor!.alive()).toBe(true);
      await survivor!.waitForLine(new RegExp(`check job ${job.id} done: report stored \\(${ROWS} rows\\)`));
    },
  );

  it(
    "a download that hangs mid-file fails that attempt; the next attempt checks the batch",
    { timeout: processTestTimeout(4) },
    async () => {
      const db = getDb();
      const w = survivor!;
      const { versionId, size } = await queueLarge(708, "harrowgate-hanging.csv");
      // the service stops sending mid-file and never resumes (the gate is not released)
      await gate.holdNext(Math.floor(size * 0.4));
      const [job] = await db.select().from(checkJobs).where(eq(checkJobs.batchVersionId, versionId));
      await w.waitForLine(
        new RegExp(`check job ${job!.id} attempt 1 failed: The upload service sent no data for 6 s`),
      );
      // the failure is recorded (the job goes back to the queue for 2 s, then is claimed again)
      const failed = await waitFor("the failed attempt to be recorded", async () => {
        const [j] = await db.select().from(checkJobs).where(eq(checkJobs.id, job!.id));
        return j?.lastError ? j : null;
      });
      expect(failed.lastError).toMatch(/sent no data for 6 s; the check is tried again later/);
      expect(failed.status).not.toBe("failed");
      const done = await waitFor("the second attempt to finish", async () => {
        const [j] = await db.select().from(checkJobs).where(eq(checkJobs.id, job!.id));
        return j?.status === "done" ? j : null;
      });
      expect(done.attempts).toBe(2);
      const o = (await outcome(db, [versionId])).get(versionId)!;
      expect(o.reports).toHaveLength(1);
      expect(Number(o.reports[0]!.rows)).toBe(ROWS);
      expect(o.state).toBe("ready");
    },
  );
});
