/**
 * The lead's board against the real database: batches by state with time in state,
 * turnaround median and 90th percentile, bounce rate and versions per batch by provider,
 * admitted providers with nothing sent, the pool's headroom; and the quantile rule (R type 7).
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { batchVersions, decisions } from "@/db/schema";
import { barleyBatches } from "@/lib/demo/batches";
import { decideVersion } from "@/lib/batches/commands-decide";
import {
  getBoard,
  intakeFlow,
  listBoardBatches,
  poolHeadrooms,
  providerStats,
  silentProviders,
  turnaroundByWeek,
} from "@/lib/pool/queries-board";
import { quantile, weekStart } from "@/lib/pool/board-stats";
import { uploadAndCheck, userId } from "./helpers/pipeline";
import { releaseScratchStudy, scratchStudy } from "./helpers/seeded";

vi.mock("server-only", () => ({}));

const db = getDb();
const SLUG = `board-${process.pid}`;
const HOUR = 3_600_000;
// a fixed Wednesday noon, so the two decisions fall in one ISO week
const NOW = new Date("2026-11-25T12:00:00.000Z");
let ids: { accepted: string; resubmitted: string };

beforeAll(async () => {
  await scratchStudy(SLUG, {
    title: `Board test ${SLUG}`,
    providers: ["harrowgate", "fennick-hill", "brackenridge"],
  });
  const analyst = await userId("analyst@lowmoor.test");
  const demo = barleyBatches();
  const a = await uploadAndCheck("provider@harrowgate.test", SLUG, demo[0]!.csv);
  expect((await decideVersion(analyst, a.batchPublicId, 1, { decision: "accept" })).ok).toBe(true);
  const b = await uploadAndCheck("provider@fennick.test", SLUG, demo[1]!.csv);
  expect(
    (
      await decideVersion(analyst, b.batchPublicId, 1, {
        decision: "bounce",
        comment: "Soil levels as in the plan.",
      })
    ).ok,
  ).toBe(true);
  const b2 = await uploadAndCheck("provider@fennick.test", SLUG, demo[5]!.csv, {
    batchPublicId: b.batchPublicId,
  });
  // known times: a decided 10 h after upload, b v1 30 h after; b v2 waiting for 5 h
  const set = async (versionId: number, uploaded: Date, changed: Date, decided?: Date) => {
    await db
      .update(batchVersions)
      .set({ uploadedAt: uploaded, stateChangedAt: changed })
      .where(eq(batchVersions.id, versionId));
    if (decided)
      await db.update(decisions).set({ decidedAt: decided }).where(eq(decisions.batchVersionId, versionId));
  };
  await set(
    a.batchVersionId,
    new Date(NOW.getTime() - 40 * HOUR),
    new Date(NOW.getTime() - 30 * HOUR),
    new Date(NOW.getTime() - 30 * HOUR),
  );
  await set(
    b.batchVersionId,
    new Date(NOW.getTime() - 50 * HOUR),
    new Date(NOW.getTime() - 20 * HOUR),
    new Date(NOW.getTime() - 20 * HOUR),
  );
  await set(b2.batchVersionId, new Date(NOW.getTime() - 5 * HOUR), new Date(NOW.getTime() - 5 * HOUR));
  ids = { accepted: a.batchPublicId, resubmitted: b.batchPublicId };
});

afterAll(async () => {
  await releaseScratchStudy(SLUG);
  await getPool().end();
});

describe("quantile", () => {
  // reference: R 4 `quantile(c(3.5, 10, 30, 47.25, 2, 71, 18), c(.5, .9))` → 18.00 56.75; `quantile(c(10, 30), c(.5, .9))` → 20 28
  it.each([
    [[3.5, 10, 30, 47.25, 2, 71, 18], 0.5, 18],
    [[3.5, 10, 30, 47.25, 2, 71, 18], 0.9, 56.75],
    [[10, 30], 0.5, 20],
    [[10, 30], 0.9, 28],
    [[7], 0.9, 7],
  ])("quantile(%j, %d) = %d", (xs, p, q) => {
    expect(quantile(xs, p)).toBeCloseTo(q, 12);
  });
  it("is null for no values, and weeks start on Monday (UTC)", () => {
    expect(quantile([], 0.5)).toBeNull();
    expect(weekStart(NOW).toISOString()).toBe("2026-11-23T00:00:00.000Z");
    expect(weekStart(new Date("2026-11-29T23:59:00Z")).toISOString()).toBe("2026-11-23T00:00:00.000Z");
    expect(weekStart(new Date("2026-11-30T00:00:00Z")).toISOString()).toBe("2026-11-30T00:00:00.000Z");
  });
});

describe("the board", () => {
  it("lists the newest version of each batch in its state with the hours it has sat there", async () => {
    const mine = (await listBoardBatches(db, NOW)).filter((b) => b.studySlug === SLUG);
    expect(mine.map((b) => [b.batchPublicId, b.version, b.state, b.hoursInState])).toEqual([
      [ids.accepted, 1, "accepted", 30],
      [ids.resubmitted, 2, "ready", 5],
    ]);
  });

  it("gives turnaround upload → decision as median and 90th percentile by week", async () => {
    const t = await turnaroundByWeek(db, { weeks: 4, now: NOW, studySlug: SLUG });
    expect(t.weeks.map((w) => w.week)).toEqual(["2026-11-02", "2026-11-09", "2026-11-16", "2026-11-23"]);
    // 10 h and 30 h: R quantile(c(10, 30), c(.5, .9)) → 20 28
    expect(t.weeks[3]).toEqual({ week: "2026-11-23", decisions: 2, medianHours: 20, p90Hours: 28 });
    expect(t.weeks[0]).toEqual({ week: "2026-11-02", decisions: 0, medianHours: null, p90Hours: null });
    expect(t.overall).toEqual({ decisions: 2, medianHours: 20, p90Hours: 28 });
  });

  it("gives bounce rate and versions per batch by provider, and who has sent nothing", async () => {
    const stats = (await providerStats(db)).filter((p) => p.studySlug === SLUG);
    expect(stats).toEqual([
      expect.objectContaining({
        organisationName: "Fennick Hill Farm",
        batches: 1,
        versions: 2,
        versionsPerBatch: 2,
        accepted: 0,
        bounced: 1,
        bounceRate: 1,
      }),
      expect.objectContaining({
        organisationName: "Harrowgate Farm",
        batches: 1,
        versions: 1,
        versionsPerBatch: 1,
        accepted: 1,
        bounced: 0,
        bounceRate: 0,
      }),
    ]);
    expect(
      (await silentProviders(db)).filter((s) => s.studySlug === SLUG).map((s) => s.organisationName),
    ).toEqual(["Brackenridge Farm"]);
  });

  it("shows the pool against its df target and the intake flow", async () => {
    const pool = (await poolHeadrooms(db)).find((p) => p.studySlug === SLUG)!;
    // one accepted clean batch of 180 plots; the plan's target is 150 residual df (lib/demo/plans.ts)
    expect(pool).toMatchObject({ batches: 1, rows: 180, completeCases: 180, dfTarget: 150 });
    expect(pool.residualDf).toBe(180 - pool.parameters - 1);
    expect(pool.headroom).toBe(pool.residualDf - 150);
    const flow = await intakeFlow(db, new Date(NOW.getTime() - 60 * HOUR), NOW);
    const f = (from: string, to: string) => flow.find((x) => x.from === from && x.to === to)?.versions ?? 0;
    // other test files' versions were uploaded at the real time, after NOW: only this file's three fall in the window
    expect([
      f("received", "checking"),
      f("checking", "ready"),
      f("ready", "accepted"),
      f("ready", "bounced"),
    ]).toEqual([3, 3, 1, 1]);
    const board = await getBoard(db, NOW, 4);
    expect(board.pools.some((p) => p.studySlug === SLUG)).toBe(true);
  });
});
