/**
 * The services' clock (lib/core/clock.ts), as the demo season uses it: with the clock set back,
 * an upload, its check, the decision and its e-mail carry the set moments; the board's
 * turnaround reads them; the headroom history rebuilds the pool's residual df week by week
 * and ends where the merged pool (the engine's poolReport) stands.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { batchVersions, decisions, emailOutbox } from "@/db/schema";
import { barleyBatches } from "@/lib/demo/batches";
import { decideVersion } from "@/lib/batches/commands-decide";
import { now, setClock } from "@/lib/core/clock";
import { getStudyPool, poolFigures } from "@/lib/pool/pool";
import { headroomByWeek } from "@/lib/pool/headroom-history";
import { turnaroundByWeek } from "@/lib/pool/queries-board";
import { uploadAndCheck, userId } from "./helpers/pipeline";
import { releaseScratchStudy, scratchStudy } from "./helpers/seeded";

vi.mock("server-only", () => ({}));

const db = getDb();
const SLUG = `clock-${process.pid}`;
const HOUR = 3_600_000;
// a Monday morning in the past: the upload, then the decision 20 hours later in the same ISO week
const UPLOADED = new Date("2026-10-05T09:00:00.000Z");
const DECIDED = new Date(UPLOADED.getTime() + 20 * HOUR);
let studyId = 0;
let versionId = 0;

beforeAll(async () => {
  studyId = (await scratchStudy(SLUG, { title: `Clock test ${SLUG}`, providers: ["harrowgate"] })).id;

  setClock(UPLOADED);
  const up = await uploadAndCheck("provider@harrowgate.test", SLUG, barleyBatches()[0]!.csv);
  versionId = up.batchVersionId;
  setClock(DECIDED);
  const r = await decideVersion(await userId("analyst@lowmoor.test"), up.batchPublicId, 1, {
    decision: "accept",
  });
  expect(r.ok).toBe(true);
  setClock(null);
});

afterAll(async () => {
  setClock(null);
  await releaseScratchStudy(SLUG);
  await getPool().end();
});

describe("the services' clock", () => {
  it("is the wall clock unless set", () => {
    const before = Date.now();
    const t = now().getTime();
    expect(t).toBeGreaterThanOrEqual(before);
    setClock(UPLOADED);
    expect(now().toISOString()).toBe(UPLOADED.toISOString());
    setClock(null);
    expect(now().getTime()).toBeGreaterThanOrEqual(before);
  });

  it("stamps the upload, its check, the decision and the e-mail with the moments set", async () => {
    const [v] = await db
      .select({
        uploadedAt: batchVersions.uploadedAt,
        state: batchVersions.state,
        changed: batchVersions.stateChangedAt,
      })
      .from(batchVersions)
      .where(eq(batchVersions.id, versionId));
    expect(v?.uploadedAt.toISOString()).toBe(UPLOADED.toISOString());
    expect(v?.state).toBe("accepted");
    expect(v?.changed.toISOString()).toBe(DECIDED.toISOString());
    const [d] = await db
      .select({ decidedAt: decisions.decidedAt })
      .from(decisions)
      .where(eq(decisions.batchVersionId, versionId));
    expect(d?.decidedAt.toISOString()).toBe(DECIDED.toISOString());
    const mails = await db
      .select({ createdAt: emailOutbox.createdAt })
      .from(emailOutbox)
      .where(eq(emailOutbox.kind, "decision"));
    expect(mails.some((m) => m.createdAt.toISOString() === DECIDED.toISOString())).toBe(true);
  });

  it("gives the board a turnaround of 20 hours in the decision's week", async () => {
    const t = await turnaroundByWeek(db, {
      weeks: 2,
      now: new Date(UPLOADED.getTime() + 3 * 24 * HOUR),
      studySlug: SLUG,
    });
    const week = t.weeks.find((w) => w.week === "2026-10-05");
    expect(week?.decisions).toBe(1);
    expect(week?.medianHours).toBeCloseTo(20, 9);
  });

  it("rebuilds the pool's residual df by week: nothing before the acceptance, then the merged pool's figure", async () => {
    const pool = await getStudyPool(db, { id: studyId, slug: SLUG, title: "", currentPlanVersion: 1 });
    const figures = poolFigures(pool);
    const fitted = pool.report.model.parameters + (pool.plan.intercept ? 1 : 0);
    const weeks = await headroomByWeek(db, studyId, fitted, {
      weeks: 3,
      now: new Date("2026-10-14T12:00:00.000Z"),
    });
    expect(weeks.map((w) => w.week)).toEqual(["2026-09-28", "2026-10-05", "2026-10-12"]);
    expect(weeks[0]!.residualDf).toBe(0);
    // independent of the merge: complete cases add up across batches, less p and the intercept
    expect(weeks[1]!.residualDf).toBe(figures.residualDf);
    expect(weeks[2]!.residualDf).toBe(figures.residualDf);
    expect(figures.residualDf).toBeGreaterThan(0);
  });
});
