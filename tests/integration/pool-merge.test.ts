/**
 * The pool from stored engine states equals the engine run on the concatenated accepted files;
 * accepting a batch updates the pool; superseded and bounced versions never enter it; the
 * "if accepted" figures are the pool's after the acceptance.
 * Reference: checkBatch on one file holding the accepted CSVs under one header — the pooled
 * least-squares fit is the fit on the stacked rows (normal equations add: X'X = Σ X_b'X_b).
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDb, getPool } from "@/db/client";
import { barleyBatches } from "@/lib/demo/batches";
import { checkBatch, type Plan, type ReadinessReport } from "@/lib/readiness";
import { decideVersion } from "@/lib/batches/commands-decide";
import { getIfAccepted, getStudyPool, getStudyRef } from "@/lib/pool/pool";
import { streamOf, uploadAndCheck, userId } from "./helpers/pipeline";
import { releaseScratchStudy, scratchStudy } from "./helpers/seeded";

vi.mock("server-only", () => ({}));

const db = getDb();
const SLUG = `pool-merge-${process.pid}`;

/** The CSVs under one header (all demo barley files share it). */
function concat(csvs: string[]): string {
  return csvs.map((c, i) => (i === 0 ? c : c.slice(c.indexOf("\n") + 1))).join("");
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

function expectSameFigures(pool: ReadinessReport, ref: ReadinessReport) {
  expect(pool.rows).toEqual(ref.rows);
  expect(pool.model.parameters).toBe(ref.model.parameters);
  expect(pool.model.residualDf).toBe(ref.model.residualDf);
  expect(pool.fit).not.toBeNull();
  expect(ref.fit).not.toBeNull();
  expect(rel(pool.fit!.rSquared, ref.fit!.rSquared)).toBeLessThan(1e-9);
  expect(rel(pool.fit!.F!, ref.fit!.F!)).toBeLessThan(1e-9);
  expect(pool.fit!.coefficients.map((c) => c.term)).toEqual(ref.fit!.coefficients.map((c) => c.term));
  pool.fit!.coefficients.forEach((c, i) => {
    const r = ref.fit!.coefficients[i]!;
    if (r.estimate === null) expect(c.estimate).toBeNull();
    else expect(rel(c.estimate!, r.estimate)).toBeLessThan(1e-9);
    if (r.stdError !== null) expect(rel(c.stdError!, r.stdError)).toBeLessThan(1e-9);
  });
}

let plan: Plan;
beforeAll(async () => {
  plan = (await scratchStudy(SLUG, { title: `Pool test ${SLUG}`, team: "lowmoor" })).plan;
});
afterAll(async () => {
  await releaseScratchStudy(SLUG);
  await getPool().end();
});

describe("the pool", () => {
  const demo = barleyBatches();
  const harrowgate = demo[0]!.csv;
  const fennick = demo[1]!.csv;
  const bracken = demo[2]!.csv;
  const coldwell = demo[5]!.csv;

  it("is empty before anything is accepted, and a bounced version never enters it", async () => {
    const analyst = await userId("analyst@lowmoor.test");
    const up = await uploadAndCheck("provider@fennick.test", SLUG, fennick);
    const r = await decideVersion(analyst, up.batchPublicId, 1, {
      decision: "bounce",
      comment: "Soil levels as in the plan, please.",
    });
    expect(r.ok).toBe(true);
    const pool = await getStudyPool(db, (await getStudyRef(db, { slug: SLUG }))!);
    expect(pool.members).toHaveLength(0);
    expect(pool.report.rows.total).toBe(0);
    expect(pool.report.findings[0]?.code).toBe("pool.empty");
  });

  it("equals checkBatch on the concatenated accepted files, and each acceptance updates it", async () => {
    const analyst = await userId("analyst@lowmoor.test");
    const study = (await getStudyRef(db, { slug: SLUG }))!;
    const a = await uploadAndCheck("provider@harrowgate.test", SLUG, harrowgate, { name: "harrowgate.csv" });
    expect((await decideVersion(analyst, a.batchPublicId, 1, { decision: "accept" })).ok).toBe(true);
    const one = await getStudyPool(db, study);
    expect(one.members.map((m) => m.batchPublicId)).toEqual([a.batchPublicId]);
    expectSameFigures(one.report, await checkBatch(streamOf(harrowgate), plan));

    const b = await uploadAndCheck("provider@harrowgate.test", SLUG, coldwell, { name: "coldwell.csv" });
    const c = await uploadAndCheck("provider@fennick.test", SLUG, bracken, { name: "bracken.csv" });
    // "if accepted" for b before its acceptance: the pool of a + b, and drift against a
    const ifB = await getIfAccepted(db, b.batchPublicId, 1);
    expect(ifB).not.toBeNull();
    expect(ifB!.poolMembers).toBe(1);
    expectSameFigures(ifB!.after, await checkBatch(streamOf(concat([harrowgate, coldwell])), plan));
    // c lost a third of irrigation_mm: missingness moved by more than 10 points against the pool [lib/readiness/CHECKS.md "Pool and drift"]
    const ifC = await getIfAccepted(db, c.batchPublicId, 1);
    expect(ifC!.drift.map((f) => `${f.code}:${f.columns.join()}`)).toContain("drift.missing:irrigation_mm");

    expect((await decideVersion(analyst, b.batchPublicId, 1, { decision: "accept" })).ok).toBe(true);
    expect((await decideVersion(analyst, c.batchPublicId, 1, { decision: "accept" })).ok).toBe(true);
    const three = await getStudyPool(db, study);
    expect(three.members).toHaveLength(3);
    const ref = await checkBatch(streamOf(concat([harrowgate, coldwell, bracken])), plan);
    expect(ref.rows.total).toBe(180 + 240 + 150);
    expectSameFigures(three.report, ref);
    // the level counts per factor add up over the pool
    const soil = three.report.columns.find((col) => col.name === "soil");
    expect(soil?.levels?.reduce((s, l) => s + l.count, 0)).toBe(
      ref.columns.find((col) => col.name === "soil")?.levels?.reduce((s, l) => s + l.count, 0),
    );
    // once decided, a version has no "if accepted"
    expect(await getIfAccepted(db, c.batchPublicId, 1)).toBeNull();
  });

  it("takes a resubmitted batch's newest version once accepted and never its superseded one", async () => {
    const analyst = await userId("analyst@lowmoor.test");
    const study = (await getStudyRef(db, { slug: SLUG }))!;
    const otter = demo[3]!.csv;
    const v1 = await uploadAndCheck("provider@harrowgate.test", SLUG, otter, { name: "otter-v1.csv" });
    const v2csv = concat([otter, demo[0]!.csv.split("\n").slice(0, 41).join("\n") + "\n"]);
    await uploadAndCheck("provider@harrowgate.test", SLUG, v2csv, {
      batchPublicId: v1.batchPublicId,
      name: "otter-v2.csv",
    });
    // version 1 is superseded: it can neither be decided nor enter the pool
    expect((await decideVersion(analyst, v1.batchPublicId, 1, { decision: "accept" })).ok).toBe(false);
    expect(await getIfAccepted(db, v1.batchPublicId, 1)).toBeNull();
    const during = await getStudyPool(db, study);
    expect(during.members.map((m) => m.fileName).sort()).toEqual([
      "bracken.csv",
      "coldwell.csv",
      "harrowgate.csv",
    ]);

    expect((await decideVersion(analyst, v1.batchPublicId, 2, { decision: "accept" })).ok).toBe(true);
    const after = await getStudyPool(db, study);
    expect(after.members.map((m) => `${m.fileName}@${m.version}`).sort()).toEqual([
      "bracken.csv@1",
      "coldwell.csv@1",
      "harrowgate.csv@1",
      "otter-v2.csv@2",
    ]);
    expectSameFigures(
      after.report,
      await checkBatch(streamOf(concat([harrowgate, coldwell, bracken, v2csv])), plan),
    );
  });
});
