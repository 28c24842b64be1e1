/**
 * The pool's questions, end to end: versions sent through intake and the check worker,
 * accepted through the decision service; the worker's pool-questions jobs store figures equal
 * to poolQuestions on the stored states, and the API answers them per role.
 * References: poolQuestions (lib/readiness/pooling) on the engine states stored with the
 * versions; R's anova(lm(y ~ X), lm(y ~ X * g)) for the Chow tests and
 * anova(lm(y ~ X), lm(y ~ X * batch)) for the whole pool (tests/r/pool-chow.R, Chow 1960) on
 * the concatenated demo files.
 */
import { writeFileSync, mkdtempSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, desc, eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import {
  checkJobs,
  dataPlans,
  ifAcceptedQuestions,
  organisations,
  reports,
  studies,
  studyAnalysts,
  studyProviders,
} from "@/db/schema";
import { barleyBatches, BRACKENRIDGE_NITROGEN_RESPONSE } from "@/lib/demo/batches";
import { BARLEY_PLAN } from "@/lib/demo/plans";
import {
  hashPlan,
  parsePlan,
  poolQuestions,
  type Plan,
  type PoolMember,
  type PoolQuestions,
} from "@/lib/readiness";
import { loadAccepted } from "@/lib/pool/pool";
import { getIfAcceptedView, getPoolQuestionsView } from "@/lib/pool/questions";
import { claimPoolQuestionsJob } from "@/lib/pool/questions-claim";
import { runPoolQuestionsJob } from "@/lib/pool/questions-job";
import { poolabilityHandler, selectionHandler } from "@/lib/pool/questions-handlers";
import { decideVersion } from "@/lib/batches/commands-decide";
import { publishPlanVersion } from "@/lib/studies/commands-plans";
import { rscriptAvailable, runRJson } from "../helpers/rscript";
import { uploadAndCheck, userId } from "./helpers/pipeline";
import { callAs } from "./helpers/security-world";

vi.mock("server-only", () => ({}));

const db = getDb();
const SLUG = `pool-questions-${process.pid}`;
const FARMS = ["harrowgate", "coldwell", "brackenridge"];
const demo = barleyBatches();
const byTitle = (t: string) => demo.find((b) => b.title.startsWith(t))!;
const UPLOADS = [
  ["provider@harrowgate.test", byTitle("Harrowgate plots, spring")],
  ["provider@coldwell.test", byTitle("Coldwell plots, spring")],
  ["provider@harrowgate.test", byTitle("Harrowgate plots, Long Meadow")],
  ["provider@coldwell.test", byTitle("Coldwell plots, Top Field")],
  ["provider@brackenridge.test", byTitle("Brackenridge")],
] as const;

let studyIdOf = 0;
let plan: Plan;
let planHash = "";
const versions: { id: number; publicId: string; title: string; csv: string; org: string }[] = [];

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);
const json = <T>(x: T): T => JSON.parse(JSON.stringify(x)) as T;

/** Runs every runnable pool-questions job, as the worker's loop would; how many ran. */
async function runPoolJobs(): Promise<number> {
  let n = 0;
  for (
    let job = await claimPoolQuestionsJob(db, "test-worker");
    job;
    job = await claimPoolQuestionsJob(db, "test-worker")
  ) {
    expect(await runPoolQuestionsJob(db, job)).toBe(true);
    n++;
  }
  return n;
}

async function queuedPoolJobs() {
  return db
    .select({ id: checkJobs.id, candidateVersionId: checkJobs.candidateVersionId })
    .from(checkJobs)
    .where(
      and(
        eq(checkJobs.kind, "pool_questions"),
        eq(checkJobs.studyId, studyIdOf),
        eq(checkJobs.status, "queued"),
      ),
    );
}

/** The reference: poolQuestions on the states stored with the accepted versions (and one under review). */
async function reference(candidateVersionId?: number): Promise<PoolQuestions> {
  const asMember = (l: Awaited<ReturnType<typeof loadAccepted>>[number]): PoolMember => ({
    id: String(l.member.batchVersionId),
    label: `${l.member.batchTitle}, v${l.member.version}`,
    group: String(l.member.organisationId),
    groupLabel: l.member.organisationName,
    state: l.state as PoolMember["state"],
  });
  const accepted = await loadAccepted(db, studyIdOf, planHash);
  const members = accepted.map(asMember);
  if (candidateVersionId === undefined) return poolQuestions(members, plan);
  const v = versions.find((x) => x.id === candidateVersionId)!;
  const [rep] = await db
    .select({ state: reports.engineState })
    .from(reports)
    .where(eq(reports.batchVersionId, v.id))
    .orderBy(desc(reports.id))
    .limit(1);
  const [org] = await db
    .select({ id: organisations.id, name: organisations.name })
    .from(organisations)
    .where(eq(organisations.slug, v.org));
  const candidate: PoolMember = {
    id: String(v.id),
    label: `${v.title}, v1`,
    group: String(org!.id),
    groupLabel: org!.name,
    state: rep!.state as PoolMember["state"],
  };
  // "if accepted" is computed without the selection preview (lib/pool/questions-compute.ts)
  return poolQuestions(members, plan, { candidate, selection: false });
}

async function orgId(slug: string) {
  const [o] = await db
    .select({ id: organisations.id })
    .from(organisations)
    .where(eq(organisations.slug, slug));
  return o!.id;
}

type RF = { F: number[]; df1: number[]; df2: number[]; p: number[] };
type ROut = { whole: RF; batches: Record<string, { chow: RF }>; candidate?: { chow: RF } };

/** R's Chow tests on the concatenated files of the given versions (tests/r/pool-chow.R). */
function rChow(ids: number[], candidate?: number): ROut {
  const planned = [
    "nitrogen_kg_ha",
    "irrigation_mm",
    "rainfall_mm",
    "total_water_mm",
    "soil",
    "variety",
    "sowing_doy",
    "plant_density",
    "organic_matter_pct",
  ];
  const rows: string[] = [["y", ...planned, "batch", "grp"].join(",")];
  for (const id of [...ids, ...(candidate ? [candidate] : [])]) {
    const v = versions.find((x) => x.id === id)!;
    const parsed = Papa.parse<Record<string, string>>(v.csv, { header: true, skipEmptyLines: true });
    for (const r of parsed.data)
      rows.push(
        [
          r.yield_t_ha,
          ...planned.map((c) => (r[c] === "" ? "NA" : JSON.stringify(r[c]))),
          `v${id}`,
          v.org,
        ].join(","),
      );
  }
  const file = path.join(mkdtempSync(path.join(os.tmpdir(), "pool-questions-")), "pool.csv");
  writeFileSync(file, rows.join("\n") + "\n");
  return runRJson<ROut>("pool-chow.R", [file, planned.join(" + "), ...(candidate ? [`v${candidate}`] : [])]);
}

function expectLikeR(ours: { F: number | null; df1: number; df2: number; p: number | null }, r: RF) {
  expect(ours.df1).toBe(r.df1[0]);
  expect(ours.df2).toBe(r.df2[0]);
  expect(rel(ours.F!, r.F[0]!)).toBeLessThan(1e-7);
  expect(Math.abs(ours.p! - r.p[0]!)).toBeLessThan(1e-9 + 1e-6 * r.p[0]!);
}

const R = rscriptAvailable();

beforeAll(async () => {
  const parsed = parsePlan(BARLEY_PLAN);
  if (!parsed.ok) throw new Error("demo plan invalid");
  plan = parsed.plan;
  planHash = await hashPlan(plan);
  const lead = await userId("lead@lowmoor.test");
  const [s] = await db
    .insert(studies)
    .values({ slug: SLUG, title: `Pool questions ${SLUG}`, currentPlanVersion: 1, createdById: lead })
    .$returningId();
  studyIdOf = s!.id;
  await db.insert(dataPlans).values({ studyId: studyIdOf, version: 1, plan, planHash, createdById: lead });
  for (const slug of FARMS)
    await db.insert(studyProviders).values({ studyId: studyIdOf, organisationId: await orgId(slug) });
  await db.insert(studyAnalysts).values({ studyId: studyIdOf, userId: await userId("analyst@lowmoor.test") });
  for (const [email, b] of UPLOADS) {
    const up = await uploadAndCheck(email, SLUG, b.csv, { name: b.fileName });
    // uploaded without a title, a batch is named after its file
    versions.push({
      id: up.batchVersionId,
      publicId: up.batchPublicId,
      title: b.fileName.replace(/\.csv$/, ""),
      csv: b.csv,
      org: b.organisationSlug,
    });
  }
}, 120_000);

afterAll(async () => {
  // leave the demo accounts' memberships as the seed made them, for the other test files
  await db.delete(studyProviders).where(eq(studyProviders.studyId, studyIdOf));
  await db.delete(studyAnalysts).where(eq(studyAnalysts.studyId, studyIdOf));
  await getPool().end();
});

describe("pool questions computed by the worker and stored", () => {
  it("a finished check queues its version's 'if accepted'; accepting queues the study once; the worker stores poolQuestions' figures", async () => {
    const bracken = versions.at(-1)!;
    // the last check to finish queued its own job (uploadAndCheck drains the queue before each upload)
    expect((await queuedPoolJobs()).map((j) => j.candidateVersionId)).toEqual([bracken.id]);
    const analyst = await userId("analyst@lowmoor.test");
    for (const v of versions.slice(0, 4))
      expect((await decideVersion(analyst, v.publicId, 1, { decision: "accept" })).ok).toBe(true);
    // four acceptances, one whole-study job waiting (it covers the version's job queued before it too)
    const queued = await queuedPoolJobs();
    expect(queued.filter((j) => j.candidateVersionId === null)).toHaveLength(1);
    const ids = versions
      .slice(0, 4)
      .map((v) => v.id)
      .sort((a, b) => a - b);
    const before = await getPoolQuestionsView(db, studyIdOf, { planVersion: 1, versionIds: ids });
    expect(before).toMatchObject({ stored: null, recomputing: true });

    expect(await runPoolJobs()).toBeGreaterThanOrEqual(1);
    const view = await getPoolQuestionsView(db, studyIdOf, { planVersion: 1, versionIds: ids });
    expect(view.recomputing).toBe(false);
    expect(view.outOfDate).toBe(false);
    expect(view.stored).toMatchObject({ planVersion: 1, versionIds: ids, error: null });
    expect(view.stored!.result).toEqual(json(await reference()));
    const q = view.stored!.result!;
    expect(q.poolability.batches).toHaveLength(4);
    expect(q.selection?.candidates).toEqual(plan.selection?.candidates);

    const ifAccepted = await getIfAcceptedView(db, studyIdOf, bracken.id, {
      planVersion: 1,
      versionIds: ids,
    });
    expect(ifAccepted.stored!.versionIds).toEqual(ids);
    expect(ifAccepted.stored!.result).toEqual(json(await reference(bracken.id)));
    // Brackenridge's plots hardly respond to nitrogen (lib/demo/batches.ts): the pool's questions flag it
    expect(BRACKENRIDGE_NITROGEN_RESPONSE).toBeLessThan(1);
    const c = ifAccepted.stored!.result!.poolability.candidate!;
    expect(c.p!).toBeLessThan(0.05);
    expect(c.largest?.column).toBe("nitrogen_kg_ha");
    expect(ifAccepted.stored!.result!.influence.candidate?.influential).toBe(true);

    if (!R.ok) return console.warn(`R comparison skipped: ${R.reason}`);
    const r = rChow(ids, bracken.id);
    expectLikeR(q.poolability.whole!, r.whole);
    for (const b of q.poolability.batches) expectLikeR(b, r.batches[`v${b.id}`]!.chow);
    expectLikeR(c, r.candidate!.chow);
  }, 120_000);

  it("accepting the version under review recomputes the pool: Brackenridge is the batch that is not poolable, and its 'if accepted' row goes", async () => {
    const bracken = versions.at(-1)!;
    expect(
      (
        await decideVersion(await userId("analyst@lowmoor.test"), bracken.publicId, 1, {
          decision: "accept",
        })
      ).ok,
    ).toBe(true);
    await runPoolJobs();
    const ids = versions.map((v) => v.id).sort((a, b) => a - b);
    const view = await getPoolQuestionsView(db, studyIdOf, { planVersion: 1, versionIds: ids });
    expect(view.stored!.versionIds).toEqual(ids);
    const q = view.stored!.result!;
    expect(q).toEqual(json(await reference()));
    const flagged = q.poolability.batches.filter((b) => b.p !== null && b.p < 0.05).map((b) => b.id);
    expect(flagged).toEqual([String(bracken.id)]);
    expect(
      q.findings.some((f) => f.code === "pool.not-poolable" && f.message.includes("brackenridge-2026")),
    ).toBe(true);
    expect(
      q.findings.some((f) => f.code === "pool.influential-batch" && f.message.includes("brackenridge-2026")),
    ).toBe(true);
    expect(
      await db
        .select({ id: ifAcceptedQuestions.id })
        .from(ifAcceptedQuestions)
        .where(eq(ifAcceptedQuestions.batchVersionId, bracken.id)),
    ).toEqual([]);
    if (!R.ok) return console.warn(`R comparison skipped: ${R.reason}`);
    const r = rChow(ids);
    expectLikeR(q.poolability.whole!, r.whole);
    expectLikeR(
      q.poolability.batches.find((b) => b.id === String(bracken.id))!,
      r.batches[`v${bracken.id}`]!.chow,
    );
  }, 120_000);

  it("the API answers the stored figures to the study's analyst and a lead; other roles and studies are refused", async () => {
    const stored = (await getPoolQuestionsView(db, studyIdOf, { planVersion: 1, versionIds: [] })).stored!;
    const url = (what: string) => `/api/v1/pool/${SLUG}/${what}`;
    for (const email of ["analyst@lowmoor.test", "lead@lowmoor.test", "admin@tributary.test"]) {
      const p = await callAs(poolabilityHandler, url("poolability"), { slug: SLUG }, email);
      expect(p.status).toBe(200);
      const pb = (await p.json()) as {
        data: {
          computedAt: string;
          versionIds: number[];
          poolability: unknown;
          influence: unknown;
          overall: unknown;
          findings: { code: string }[];
          recomputing: boolean;
        };
      };
      expect(pb.data.computedAt).toBe(stored.computedAt.toISOString());
      expect(pb.data.versionIds).toEqual(stored.versionIds);
      expect(pb.data.poolability).toEqual(stored.result!.poolability);
      expect(pb.data.influence).toEqual(stored.result!.influence);
      expect(pb.data.overall).toEqual(stored.result!.overall);
      expect(pb.data.findings.map((f) => f.code).every((c) => c.startsWith("pool."))).toBe(true);
      expect(pb.data.recomputing).toBe(false);
      const s = await callAs(selectionHandler, url("selection"), { slug: SLUG }, email);
      expect(s.status).toBe(200);
      const sb = (await s.json()) as { data: { selection: unknown; caution: string } };
      expect(sb.data.selection).toEqual(stored.result!.selection);
      expect(sb.data.caution).toMatch(/overstates the fit/);
    }
    for (const handler of [poolabilityHandler, selectionHandler]) {
      const what = handler === poolabilityHandler ? "poolability" : "selection";
      expect((await callAs(handler, url(what), { slug: SLUG }, "analyst2@lowmoor.test")).status).toBe(404);
      expect((await callAs(handler, url(what), { slug: SLUG }, "provider@harrowgate.test")).status).toBe(403);
      expect((await callAs(handler, url(what), { slug: SLUG }, null)).status).toBe(401);
      expect(
        (
          await callAs(
            handler,
            `/api/v1/pool/no-such-study/${what}`,
            { slug: "no-such-study" },
            "lead@lowmoor.test",
          )
        ).status,
      ).toBe(404);
    }
  });

  it("a resubmitted version under review and a republished plan queue their jobs; pages see 'being recomputed' until they are stored", async () => {
    const ids = versions.map((v) => v.id).sort((a, b) => a - b);
    const hg = versions[0]!;
    const v1 = await uploadAndCheck("provider@harrowgate.test", SLUG, hg.csv, {
      name: "harrowgate-again.csv",
    });
    const v2 = await uploadAndCheck("provider@harrowgate.test", SLUG, hg.csv, {
      batchPublicId: v1.batchPublicId,
      name: "harrowgate-again.csv",
    });
    expect(
      (await getIfAcceptedView(db, studyIdOf, v2.batchVersionId, { planVersion: 1, versionIds: ids }))
        .recomputing,
    ).toBe(true);
    await runPoolJobs();
    const ia = await getIfAcceptedView(db, studyIdOf, v2.batchVersionId, { planVersion: 1, versionIds: ids });
    expect(ia).toMatchObject({ recomputing: false, outOfDate: false });
    expect(ia.stored!.result!.poolability.candidate?.label).toBe("harrowgate-again, v2");

    const lead = await userId("lead@lowmoor.test");
    const republished = await publishPlanVersion(
      lead,
      studyIdOf,
      { ...plan, thresholds: { ...plan.thresholds, dfTarget: 200 } },
      "a higher df target",
    );
    expect(republished.ok).toBe(true);
    const during = await getPoolQuestionsView(db, studyIdOf, { planVersion: 2, versionIds: ids });
    expect(during).toMatchObject({ recomputing: true, outOfDate: true });
    await runPoolJobs();
    const after = await getPoolQuestionsView(db, studyIdOf, { planVersion: 2, versionIds: ids });
    expect(after).toMatchObject({ recomputing: false, outOfDate: false });
    expect(after.stored!.planVersion).toBe(2);
    // the higher target shows in each batch's headroom without it
    const inf = after.stored!.result!.influence.batches[0]!;
    expect(inf.without.headroom).toBe(inf.without.residualDf - 200);
    // the whole-study job keeps "if accepted" for versions under review only: the superseded v1 lost its row
    const rows = await db
      .select({ v: ifAcceptedQuestions.batchVersionId, plan: ifAcceptedQuestions.planVersion })
      .from(ifAcceptedQuestions)
      .where(eq(ifAcceptedQuestions.studyId, studyIdOf));
    expect(rows).toEqual([{ v: v2.batchVersionId, plan: 2 }]);
  }, 120_000);
});
