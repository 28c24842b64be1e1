/**
 * Fault: the database is stopped and started again during a check. The test runs its own
 * second MariaDB instance (scripts/db.sh with TRIBUTARY_DB_HOME=.data/faults-db and port 3416,
 * loaded with the run's seeded template), so the shared instance on 3406 is never touched.
 * A real worker process streams a large batch from the upload fake; the download is held
 * mid-file while the database is stopped, then let go, so the check ends while the database
 * is down. The worker keeps running, retries storing the report, and stores it once the
 * database is back: one report, the version ready, the job done on its first attempt, and
 * the audit rows of the upload and of the check — nothing half-written.
 */
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import type mysql from "mysql2/promise";
import type { Db } from "@/db/client";
import { batchVersions, checkJobs, studies, users } from "@/db/schema";
import { parseUploadToken, startUploadFake, type UploadFake } from "@/fakes/upload-service";
import { BARLEY_HEADER, barleyRows, toCsv } from "@/lib/demo/batches";
import { recordBatchVersion } from "@/lib/batches/commands-upload";
import { isDbUnavailable } from "@/db/errors";
import {
  killAllWorkers,
  loadTemplate,
  openDb,
  outcome,
  PRIVATE_DB,
  privateDb,
  startWorker,
  waitFor,
  type WorkerProcess,
} from "./helpers/faults";
import { startFileGate, storeFile, type FileGate } from "./helpers/faults-net";
import { processTestTimeout } from "../helpers/processes";

const NAME = "tributary_faults";
const ROWS = 60_000;
const token = process.env.UPLOADTHING_TOKEN!;
let url = "";
let conn: { db: Db; pool: mysql.Pool } | null = null;
let dir = "";
let fake: UploadFake;
let gate: FileGate;
let worker: WorkerProcess | undefined;

beforeAll(async () => {
  privateDb("start");
  privateDb("drop-db", NAME);
  privateDb("create-db", NAME);
  url = privateDb("url", NAME).trim();
  expect(url).toContain(`:${PRIVATE_DB.port}/`);
  // the services this file calls (recordBatchVersion) write through getDb(), which opens
  // DATABASE_URL at its first use: point it at the private instance before that
  process.env.DATABASE_URL = url;
  await loadTemplate(url, inject("databaseTemplateSql"));
  conn = openDb(url);
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-faults-db-"));
  fake = await startUploadFake({ port: 0, apiKey: parseUploadToken(token).apiKey, dir, log: () => {} });
  gate = await startFileGate(fake.url);
});

afterAll(async () => {
  await killAllWorkers();
  await conn?.pool.end().catch(() => undefined);
  await gate?.close();
  await fake?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
  try {
    privateDb("start");
    privateDb("drop-db", NAME);
  } finally {
    privateDb("stop");
  }
});

describe("the database stopped and started during a check", () => {
  it(
    "the worker waits for the database and stores the report once, whole",
    { timeout: processTestTimeout(4) },
    async () => {
      const db = conn!.db;
      const [provider] = await db
        .select({ id: users.id })
        .from(users)
        .where(eq(users.email, "provider@harrowgate.test"));
      const [study] = await db
        .select({ id: studies.id })
        .from(studies)
        .where(eq(studies.slug, "barley-nitrogen"));
      const file = await storeFile(
        fake.url,
        token,
        toCsv(BARLEY_HEADER, barleyRows("DB", ROWS, 808)),
        "harrowgate-outage.csv",
      );
      const recorded = await recordBatchVersion(provider!.id, { studyId: study!.id }, file);
      if (!recorded.ok) throw new Error(recorded.message);
      const versionId = recorded.data.batchVersionId;

      const held = gate.holdNext(Math.floor(file.size * 0.4));
      worker = startWorker({
        DATABASE_URL: url,
        UPLOADTHING_API_URL: fake.url,
        UPLOADTHING_INGEST_URL: fake.url,
        UPLOADTHING_UFS_HOST: `localhost:${gate.port}`,
        TRIBUTARY_JOB_STALE_MS: "4000",
      });
      await held;
      const claimed = await waitFor("the job to be running", async () => {
        const [j] = await db.select().from(checkJobs).where(eq(checkJobs.batchVersionId, versionId));
        return j?.status === "running" ? j : null;
      });
      expect(claimed.lockedBy).toContain(`:${worker.pid}:`);
      // mid-check: the version shows "checking" and the worker's heartbeats arrive
      const job = await waitFor("a heartbeat after the claim", async () => {
        const [j] = await db.select().from(checkJobs).where(eq(checkJobs.id, claimed.id));
        return j && j.heartbeatAt! > claimed.heartbeatAt! ? j : null;
      });
      const [v] = await db
        .select({ state: batchVersions.state })
        .from(batchVersions)
        .where(eq(batchVersions.id, versionId));
      expect(v?.state).toBe("checking");

      await conn!.pool.end();
      conn = null;
      privateDb("stop");
      gate.release();
      await worker.waitForLine(new RegExp(`database unavailable while storing the report of job ${job.id}`));
      // what the worker saw: an outage, told apart from a query that is simply wrong
      const probe = openDb(url);
      const outage = await probe.db
        .select()
        .from(checkJobs)
        .then(
          () => null,
          (e: unknown) => e,
        );
      await probe.pool.end();
      expect(outage).not.toBeNull();
      expect(isDbUnavailable(outage)).toBe(true);
      // it keeps retrying while the database is down, and the process stays up
      await new Promise((r) => setTimeout(r, 1_500));
      expect(worker.alive()).toBe(true);
      expect(worker.lines.some((l) => /done: report stored/.test(l))).toBe(false);

      privateDb("start");
      await worker.waitForLine(new RegExp(`database back: storing the report of job ${job.id} succeeded`));
      await worker.waitForLine(new RegExp(`check job ${job.id} done: report stored \\(${ROWS} rows\\)`));
      expect(worker.alive()).toBe(true);

      conn = openDb(url);
      const wrong = await conn.db.execute(sql`SELECT no_such_column FROM check_jobs`).then(
        () => null,
        (e: unknown) => e,
      );
      expect(wrong).not.toBeNull();
      expect(isDbUnavailable(wrong)).toBe(false);
      const o = (await outcome(conn.db, [versionId])).get(versionId)!;
      expect(o.reports).toHaveLength(1);
      expect(o.reports[0]!.status).toBe("checked");
      expect(Number(o.reports[0]!.rows)).toBe(ROWS);
      expect(o.state).toBe("ready");
      expect(o.audit).toEqual(["batch.checked", "batch.received"]);
      // the outage did not use up an attempt, and left no error behind
      expect(o.jobs.map((j) => [j.status, j.attempts, j.lastError])).toEqual([["done", 1, null]]);
    },
  );

  it(
    "an idle worker rides out an outage and takes new work once the database is back",
    { timeout: processTestTimeout(4) },
    async () => {
      const w = worker!;
      await conn!.pool.end();
      conn = null;
      privateDb("stop");
      await w.waitForLine(/could not claim a job \(database unavailable; waiting for it\)/);
      privateDb("start");
      await w.waitForLine(/database back after \d+ failed claims?; claiming again/);
      expect(w.alive()).toBe(true);

      conn = openDb(url);
      const db = conn.db;
      const [provider] = await db
        .select({ id: users.id })
        .from(users)
        .where(eq(users.email, "provider@harrowgate.test"));
      const [study] = await db
        .select({ id: studies.id })
        .from(studies)
        .where(eq(studies.slug, "barley-nitrogen"));
      const file = await storeFile(
        fake.url,
        token,
        toCsv(BARLEY_HEADER, barleyRows("DC", 500, 809)),
        "after-outage.csv",
      );
      const recorded = await recordBatchVersion(provider!.id, { studyId: study!.id }, file);
      if (!recorded.ok) throw new Error(recorded.message);
      const versionId = recorded.data.batchVersionId;
      await waitFor(
        "the new batch to be checked",
        async () => (await outcome(db, [versionId])).get(versionId)!.state === "ready",
      );
      const o = (await outcome(db, [versionId])).get(versionId)!;
      expect(o.reports).toHaveLength(1);
      expect(o.jobs.map((j) => [j.status, j.attempts])).toEqual([["done", 1]]);
    },
  );
});
