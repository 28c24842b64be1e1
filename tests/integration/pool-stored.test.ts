/**
 * The stored pool (lib/pool/stored.ts) equals the pool merged afresh from the accepted versions'
 * states after accepts, a republished plan and an accepted version superseded; two accepts at
 * once both land. Reference: computeStudyPool, the merge of every accepted engine state on the
 * request as it was done before the pool was stored — the normal equations add
 * (X'X = Σ X_b'X_b), so merging one state into the merged rest equals merging them all.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { batchVersions, organisations, poolStates } from "@/db/schema";
import { rebuildStoredPool } from "@/lib/pool/stored";
import { barleyBatches } from "@/lib/demo/batches";
import { BARLEY_PLAN } from "@/lib/demo/plans";
import { decideVersion } from "@/lib/batches/commands-decide";
import { createStudy, publishPlanVersion, admitProvider, assignAnalyst } from "@/lib/studies";
import { computeStudyPool, getStudyPool, getStudyRef, type StudyPool } from "@/lib/pool/pool";
import { poolHeadrooms } from "@/lib/pool/queries-board";
import { uploadAndCheck, userId } from "./helpers/pipeline";

vi.mock("server-only", () => ({}));

const db = getDb();
const SLUG = `pool-stored-${process.pid}`;
let studyId = 0;

/** Every number equal to 1e-9 relative (floating-point merges in another grouping), timings aside. */
function expectClose(a: unknown, b: unknown, path = "report"): void {
  if (typeof b === "number" && typeof a === "number") {
    const rel = Math.abs(a - b) / Math.max(Math.abs(b), 1e-12);
    if (!(rel < 1e-9 || a === b)) expect.fail(`${path}: ${a} against ${b}`);
    return;
  }
  if (Array.isArray(b)) {
    expect(Array.isArray(a), path).toBe(true);
    expect((a as unknown[]).length, `${path}.length`).toBe(b.length);
    b.forEach((v, i) => expectClose((a as unknown[])[i], v, `${path}[${i}]`));
    return;
  }
  if (b && typeof b === "object") {
    const keys = Object.keys(b).filter((k) => k !== "timings" && k !== "state");
    expect(
      Object.keys(a as object).filter((k) => k !== "timings" && k !== "state"),
      path,
    ).toEqual(keys);
    for (const k of keys) expectClose((a as never)[k], (b as never)[k], `${path}.${k}`);
    return;
  }
  expect(a, path).toEqual(b);
}

function strip(m: object): object {
  const { state: _s, stateChangedAt: _c, ...rest } = m as Record<string, unknown>;
  void _s;
  void _c;
  return rest;
}

async function bothPools(): Promise<{ stored: StudyPool; fresh: StudyPool }> {
  const study = (await getStudyRef(db, { slug: SLUG }))!;
  return { stored: await getStudyPool(db, study), fresh: await computeStudyPool(db, study) };
}

async function expectStoredEqualsFresh(members: number) {
  const [row] = await db.select().from(poolStates).where(eq(poolStates.studyId, studyId));
  expect(row, "a stored pool row").toBeDefined();
  const { stored, fresh } = await bothPools();
  expect(stored.members).toHaveLength(members);
  // the fresh merge's members also carry their state columns, which the stored ones need not
  expect(stored.members).toEqual(fresh.members.map(({ ...m }) => strip(m)));
  expectClose(stored.report, fresh.report);
  // the board's columns are the stored report's figures
  expect(row!.batches).toBe(members);
  expect(row!.residualDf).toBe(fresh.report.model.residualDf);
  expect(row!.dfTarget).toBe(fresh.report.model.dfTarget);
  const board = (await poolHeadrooms(db)).find((p) => p.studySlug === SLUG)!;
  expect(board.residualDf).toBe(fresh.report.model.residualDf);
  expect(board.headroom).toBe(fresh.report.model.residualDf - fresh.report.model.dfTarget);
}

beforeAll(async () => {
  const lead = await userId("lead@lowmoor.test");
  const [team] = await db
    .select({ id: organisations.id })
    .from(organisations)
    .where(eq(organisations.slug, "lowmoor"));
  const s = await createStudy(lead, {
    slug: SLUG,
    title: `Stored pool ${SLUG}`,
    teamOrganisationId: team!.id,
  });
  if (!s.ok) throw new Error(s.message);
  studyId = s.data.id;
  const p = await publishPlanVersion(lead, studyId, BARLEY_PLAN, "first plan");
  if (!p.ok) throw new Error(p.message);
  for (const org of ["harrowgate", "fennick-hill"]) {
    const [o] = await db
      .select({ id: organisations.id })
      .from(organisations)
      .where(eq(organisations.slug, org));
    expect((await admitProvider(lead, studyId, o!.id)).ok).toBe(true);
  }
  expect((await assignAnalyst(lead, studyId, await userId("analyst@lowmoor.test"))).ok).toBe(true);
});
afterAll(async () => {
  await getPool().end();
});

describe("the stored pool", () => {
  const demo = barleyBatches();

  it("equals the fresh merge after each accept, and two accepts at once both land", async () => {
    const analyst = await userId("analyst@lowmoor.test");
    await expectStoredEqualsFresh(0);
    const a = await uploadAndCheck("provider@harrowgate.test", SLUG, demo[0]!.csv, { name: "a.csv" });
    expect((await decideVersion(analyst, a.batchPublicId, 1, { decision: "accept" })).ok).toBe(true);
    await expectStoredEqualsFresh(1);

    const b = await uploadAndCheck("provider@harrowgate.test", SLUG, demo[5]!.csv, { name: "b.csv" });
    const c = await uploadAndCheck("provider@fennick.test", SLUG, demo[2]!.csv, { name: "c.csv" });
    const [rb, rc] = await Promise.all([
      decideVersion(analyst, b.batchPublicId, 1, { decision: "accept" }),
      decideVersion(analyst, c.batchPublicId, 1, { decision: "accept" }),
    ]);
    expect(rb.ok && rc.ok).toBe(true);
    const [row] = await db.select().from(poolStates).where(eq(poolStates.studyId, studyId));
    // both concurrent accepts are in the stored state: 180 + 240 + 150 rows (lib/demo/batches.ts)
    expect(row!.versionIds).toHaveLength(3);
    expect(row!.rowsTotal).toBe(180 + 240 + 150);
    await expectStoredEqualsFresh(3);
  });

  it("is rebuilt under a republished plan", async () => {
    const lead = await userId("lead@lowmoor.test");
    const changed = { ...BARLEY_PLAN, thresholds: { ...BARLEY_PLAN.thresholds, dfTarget: 1000 } };
    expect((await publishPlanVersion(lead, studyId, changed, "df target raised")).ok).toBe(true);
    const [row] = await db.select().from(poolStates).where(eq(poolStates.studyId, studyId));
    expect(row!.planVersion).toBe(2);
    expect(row!.dfTarget).toBe(1000);
    await expectStoredEqualsFresh(3);
  });

  it("is rebuilt without an accepted version that leaves the pool", async () => {
    const { stored: before } = await bothPools();
    const first = before.members[0]!;
    // what recording a new version does to the version it supersedes (lib/batches/commands-upload.ts)
    await db.transaction(async (tx) => {
      await tx
        .update(batchVersions)
        .set({ state: "superseded" })
        .where(eq(batchVersions.id, first.batchVersionId));
      await rebuildStoredPool(tx, studyId, { without: first.batchVersionId });
    });
    await expectStoredEqualsFresh(2);
    const { stored } = await bothPools();
    expect(stored.members.map((m) => m.batchVersionId)).not.toContain(first.batchVersionId);
  });
});
