/**
 * The check queue against the real MariaDB of the run: a version is recorded with its job,
 * two workers never take the same job, a job left by a dead worker is taken again, and a
 * report is stored whole with its state change and audit row.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, sql } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { auditEvents, batchVersions, checkJobs, reports, studies, users } from "@/db/schema";
import { recordBatchVersion } from "@/lib/batches/commands-upload";
import { claimJob, STALE_AFTER_MS } from "@/lib/batches/jobs/check-jobs";
import { runJob } from "@/lib/batches/jobs/worker";
import { barleyBatches } from "@/lib/demo/batches";
import { parsePlan, proposeFixes, type Plan } from "@/lib/readiness";
import { drainQueue, openMemoryFile, storeInMemory } from "./helpers/pipeline";

const db = getDb();
let providerId = 0;
let otherProviderId = 0;
let studyId = 0;
let heatStudyId = 0;
const openFile = openMemoryFile;
const parsedPlan = (p: unknown): Plan => {
  const r = parsePlan(p);
  if (!r.ok) throw new Error("the stored plan is not valid");
  return r.plan;
};
const store = storeInMemory;

beforeAll(async () => {
  const [p] = await db
    .select({ id: users.id })
    .from(users)
    .where(eq(users.email, "provider@harrowgate.test"));
  const [q] = await db.select({ id: users.id }).from(users).where(eq(users.email, "provider@fennick.test"));
  const [s] = await db.select({ id: studies.id }).from(studies).where(eq(studies.slug, "barley-nitrogen"));
  const [h] = await db.select({ id: studies.id }).from(studies).where(eq(studies.slug, "heat-pump-savings"));
  providerId = p!.id;
  otherProviderId = q!.id;
  studyId = s!.id;
  heatStudyId = h!.id;
  await drainQueue();
});

afterAll(async () => {
  await getPool().end();
});

describe("recording an upload", () => {
  it("creates version 1 with a queued job and audit rows, in one go", async () => {
    const r = await recordBatchVersion(providerId, { studyId }, store(barleyBatches()[0]!.csv));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.data.version).toBe(1);
    const [v] = await db.select().from(batchVersions).where(eq(batchVersions.id, r.data.batchVersionId));
    expect(v?.state).toBe("received");
    const jobs = await db.select().from(checkJobs).where(eq(checkJobs.batchVersionId, r.data.batchVersionId));
    expect(jobs).toHaveLength(1);
    expect(jobs[0]?.status).toBe("queued");
    const audit = await db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.batchId, r.data.batchId), eq(auditEvents.action, "batch.received")));
    expect(audit).toHaveLength(1);
    await drainQueue();
  });

  it("refuses a provider not admitted to the study, and stores nothing", async () => {
    const before = await db.select({ n: sql<number>`count(*)` }).from(batchVersions);
    const r = await recordBatchVersion(providerId, { studyId: heatStudyId }, store("a,b\n1,2\n"));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/not admitted/);
    const after = await db.select({ n: sql<number>`count(*)` }).from(batchVersions);
    expect(Number(after[0]!.n)).toBe(Number(before[0]!.n));
  });

  it("refuses another organisation's batch as if it did not exist", async () => {
    const mine = await recordBatchVersion(providerId, { studyId }, store("a\n1\n"));
    expect(mine.ok).toBe(true);
    if (!mine.ok) return;
    const theirs = await recordBatchVersion(
      otherProviderId,
      { studyId, batchPublicId: mine.data.batchPublicId },
      store("a\n1\n"),
    );
    expect(theirs.ok).toBe(false);
    if (!theirs.ok) expect(theirs.message).toMatch(/not found/);
    await drainQueue();
  });

  it("a resubmission is version 2 and supersedes version 1", async () => {
    const v1 = await recordBatchVersion(providerId, { studyId }, store("a\n1\n"));
    if (!v1.ok) throw new Error(v1.message);
    const v2 = await recordBatchVersion(
      providerId,
      { studyId, batchPublicId: v1.data.batchPublicId },
      store("a\n2\n"),
    );
    if (!v2.ok) throw new Error(v2.message);
    expect(v2.data.version).toBe(2);
    const [old] = await db
      .select({ state: batchVersions.state })
      .from(batchVersions)
      .where(eq(batchVersions.id, v1.data.batchVersionId));
    expect(old?.state).toBe("superseded");
    await drainQueue();
  });
});

describe("workers", () => {
  it("two workers claiming at once never take the same job", async () => {
    const ids: number[] = [];
    for (let i = 0; i < 6; i++) {
      const r = await recordBatchVersion(providerId, { studyId }, store("a\n1\n"));
      if (!r.ok) throw new Error(r.message);
      ids.push(r.data.batchVersionId);
    }
    const claimedA: number[] = [];
    const claimedB: number[] = [];
    const loop = async (name: string, into: number[]) => {
      for (;;) {
        const job = await claimJob(db, name);
        if (!job) return;
        into.push(job.batchVersionId);
      }
    };
    await Promise.all([loop("worker-a", claimedA), loop("worker-b", claimedB)]);
    const all = [...claimedA, ...claimedB].sort((a, b) => a - b);
    expect(all).toEqual([...ids].sort((a, b) => a - b));
    expect(new Set(all).size).toBe(all.length);
    await drainQueue();
  });

  it("a job left running by a dead worker is taken again and ends with one report", async () => {
    const r = await recordBatchVersion(
      providerId,
      { studyId },
      store(barleyBatches()[1]!.csv, "fennick.csv"),
    );
    if (!r.ok) throw new Error(r.message);
    const first = await claimJob(db, "doomed-worker");
    expect(first?.batchVersionId).toBe(r.data.batchVersionId);
    // the worker dies: no report, no heartbeat; nobody else may take it while it is fresh
    expect(await claimJob(db, "eager-worker")).toBeNull();
    const later = new Date(Date.now() + STALE_AFTER_MS + 5_000);
    const again = await claimJob(db, "rescue-worker", later);
    expect(again?.batchVersionId).toBe(r.data.batchVersionId);
    expect(again?.attempt).toBe(2);
    const report = await runJob({ db, openFile }, again!);
    expect(report?.status).toBe("checked");
    const stored = await db.select().from(reports).where(eq(reports.batchVersionId, r.data.batchVersionId));
    expect(stored).toHaveLength(1);
    const [v] = await db
      .select({ state: batchVersions.state })
      .from(batchVersions)
      .where(eq(batchVersions.id, r.data.batchVersionId));
    expect(v?.state).toBe("ready");
    const codes = (report?.findings ?? []).map((f) => f.code);
    // the Fennick Hill file carries "Clay"/"clay " and total_water_mm = irrigation_mm + rainfall_mm
    expect(codes).toContain("level.variant");
    const exact = report?.findings.find((f) => f.code === "collinear.exact");
    expect(exact?.message).toMatch(
      /total_water_mm = (irrigation_mm \+ rainfall_mm|rainfall_mm \+ irrigation_mm)/,
    );
    const [job] = await db
      .select({ status: checkJobs.status })
      .from(checkJobs)
      .where(eq(checkJobs.batchVersionId, r.data.batchVersionId));
    expect(job?.status).toBe("done");
  });

  it("downloads the file once: the report's fix proposals come from the same bytes as the check", async () => {
    // Fennick Hill's demo batch spells the planned level clay as Clay and "clay " (lib/demo/batches.ts)
    const fennick = barleyBatches()[1]!;
    const r = await recordBatchVersion(otherProviderId, { studyId }, store(fennick.csv));
    if (!r.ok) throw new Error(r.message);
    const job = await claimJob(db, "w-once");
    const opened: string[] = [];
    const counting = (key: string) => {
      opened.push(key);
      return openFile(key);
    };
    const report = await runJob({ db, openFile: counting, checkWorkers: 1 }, job!);
    expect(opened).toHaveLength(1);
    expect(report?.status).toBe("checked");
    // the oracle: the one-shot proposeFixes over the file's own bytes, after the check
    const alone = await proposeFixes(await openFile(opened[0]!), parsedPlan(job!.plan), report!);
    expect(alone.map((p) => p.id)).toContain("level.variant:soil");
    expect(report!.proposals).toEqual(alone);
    const [stored] = await db
      .select({ report: reports.report })
      .from(reports)
      .where(eq(reports.batchVersionId, r.data.batchVersionId));
    expect((stored!.report as { proposals?: unknown }).proposals).toEqual(alone);
  });

  it("an unreadable file ends as unreadable with its reason, not as a failed job", async () => {
    const r = await recordBatchVersion(
      providerId,
      { studyId },
      store("PK\u0003\u0004 not really a workbook", "plots.xlsx.csv"),
    );
    if (!r.ok) throw new Error(r.message);
    const job = await claimJob(db, "w");
    const report = await runJob({ db, openFile }, job!);
    expect(report?.status).toBe("unreadable");
    const [v] = await db
      .select({ state: batchVersions.state })
      .from(batchVersions)
      .where(eq(batchVersions.id, r.data.batchVersionId));
    expect(v?.state).toBe("unreadable");
  });

  it("a report too large to store fails the attempt, saying its size, and stores nothing", async () => {
    const r = await recordBatchVersion(providerId, { studyId }, store(barleyBatches()[0]!.csv));
    if (!r.ok) throw new Error(r.message);
    const job = await claimJob(db, "w");
    const lines: string[] = [];
    // 10 KB: far below the demo batch's report, as a wide batch's would once be over the real bound
    const report = await runJob({ db, openFile, maxStoredBytes: 10_000, log: (l) => lines.push(l) }, job!);
    expect(report).toBeNull();
    const [j] = await db.select().from(checkJobs).where(eq(checkJobs.id, job!.jobId));
    expect(j?.status).not.toBe("done");
    expect(j?.lastError).toMatch(
      /^The report of this batch is \d+ KB, more than the 10 KB a report may take/,
    );
    expect(lines.join("\n")).toContain("storing the report failed");
    const stored = await db.select().from(reports).where(eq(reports.batchVersionId, r.data.batchVersionId));
    expect(stored).toEqual([]);
    // the next attempt, within the bound, stores it
    const again = await claimJob(db, "w", new Date(Date.now() + 120_000));
    expect(again?.batchVersionId).toBe(r.data.batchVersionId);
    expect((await runJob({ db, openFile }, again!))?.status).toBe("checked");
  });

  it("a file that cannot be fetched fails the attempt and is retried later, then marked failed", async () => {
    const r = await recordBatchVersion(
      providerId,
      { studyId },
      { key: "missing-key", url: "http://127.0.0.1/none", name: "x.csv", size: 1 },
    );
    if (!r.ok) throw new Error(r.message);
    let now = Date.now();
    for (let attempt = 1; attempt <= 3; attempt++) {
      now += 60_000;
      const job = await claimJob(db, "w", new Date(now));
      expect(job?.attempt).toBe(attempt);
      expect(await runJob({ db, openFile }, job!)).toBeNull();
    }
    now += 600_000;
    expect(await claimJob(db, "w", new Date(now))).toBeNull();
    const [job] = await db
      .select()
      .from(checkJobs)
      .where(eq(checkJobs.batchVersionId, r.data.batchVersionId));
    expect(job?.status).toBe("failed");
    expect(job?.lastError).toMatch(/no stored file/);
  });
});
