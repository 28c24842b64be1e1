/**
 * Study, data-plan and membership services against the seeded MariaDB: field errors with the
 * engine's dotted paths, the refusal of an unchanged plan, versioning, audit rows in the same
 * transaction, and the roles that may not call them. Mutations use studies of this file's own
 * (unique slugs), so the demo studies other files read stay as seeded.
 */
import { randomBytes } from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));

import { getDb, getPool } from "@/db/client";
import {
  auditEvents,
  dataPlans,
  organisations,
  studies,
  studyAnalysts,
  studyProviders,
  users,
} from "@/db/schema";
import { BARLEY_PLAN } from "@/lib/demo/plans";
import { planHash } from "@/lib/demo/plan-hash";
import { parsePlan, type PlanInput } from "@/lib/readiness";
import {
  admitProvider,
  assignAnalyst,
  createStudy,
  publishPlanVersion,
  removeProvider,
  unassignAnalyst,
  updateStudy,
} from "@/lib/studies";

const db = getDb();
const tag = randomBytes(3).toString("hex");
const ids: Record<string, number> = {};

async function userId(email: string): Promise<number> {
  const [u] = await db.select({ id: users.id }).from(users).where(eq(users.email, email));
  if (!u) throw new Error(`no demo user ${email}`);
  return u.id;
}
async function orgId(slug: string): Promise<number> {
  const [o] = await db
    .select({ id: organisations.id })
    .from(organisations)
    .where(eq(organisations.slug, slug));
  if (!o) throw new Error(`no organisation ${slug}`);
  return o.id;
}
async function auditFor(studyId: number, action: string) {
  return db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.studyId, studyId), eq(auditEvents.action, action)))
    .orderBy(desc(auditEvents.id));
}
/** A copy of the demo barley plan (a valid plan) to change in each test. */
const barley = (): PlanInput => structuredClone(BARLEY_PLAN);

beforeAll(async () => {
  // accounts of README.md "Using Tributary, role by role"
  for (const [k, email] of Object.entries({
    admin: "admin@tributary.test",
    lead: "lead@lowmoor.test",
    analyst: "analyst@lowmoor.test",
    analyst2: "analyst2@lowmoor.test",
    provider: "provider@harrowgate.test",
  }))
    ids[k] = await userId(email);
  ids.harrowgate = await orgId("harrowgate");
  ids.fennick = await orgId("fennick-hill");
  const [team] = await db.select({ id: users.organisationId }).from(users).where(eq(users.id, ids.lead!));
  ids.team = team!.id!;
});

afterAll(async () => {
  await getPool().end();
});

describe("createStudy", () => {
  test("a lead creates a study: the row, the default team (the lead's own) and the audit row", async () => {
    const slug = `wheat-${tag}`;
    const r = await createStudy(ids.lead!, {
      slug,
      title: "Winter wheat sulphur trial",
      description: "Plots on the upper farms.",
    });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.data).toMatchObject({
      slug,
      status: "open",
      teamOrganisationId: ids.team,
      currentPlanVersion: null,
    });
    const [row] = await db.select().from(studies).where(eq(studies.slug, slug));
    expect(row?.title).toBe("Winter wheat sulphur trial");
    expect(row?.createdById).toBe(ids.lead);
    const audit = await auditFor(r.data.id, "study.create");
    expect(audit).toHaveLength(1);
    expect(audit[0]?.actorId).toBe(ids.lead);
  });

  test("a taken slug is a field error on slug, and nothing is written", async () => {
    const before = await db.select({ id: studies.id }).from(studies);
    const r = await createStudy(ids.admin!, { slug: "barley-nitrogen", title: "Another barley study" });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.fieldErrors?.slug?.[0]).toMatch(/already uses this address/);
    expect(await db.select({ id: studies.id }).from(studies)).toHaveLength(before.length);
  });

  test.each([
    ["Bad Slug!", "slug", /lower-case letters/],
    ["12345", "slug", /only of digits/],
    ["new", "slug", /reserved/],
  ])("slug %j → field error on %s", async (slug, field, message) => {
    const r = await createStudy(ids.admin!, { slug, title: "A study" });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.fieldErrors?.[field]?.join(" ")).toMatch(message);
  });

  test("a provider organisation cannot run a study", async () => {
    const r = await createStudy(ids.admin!, {
      slug: `prov-run-${tag}`,
      title: "Run by a farm",
      teamOrganisationId: ids.harrowgate,
    });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.fieldErrors?.teamOrganisationId?.[0]).toMatch(/team organisation/);
  });
});

describe("updateStudy", () => {
  test("closing and reopening write their own audit rows; a blank title is a field error", async () => {
    const c = await createStudy(ids.admin!, { slug: `close-${tag}`, title: "To be closed" });
    if (!c.ok) throw new Error(c.message);
    const closed = await updateStudy(ids.lead!, c.data.id, { status: "closed" });
    expect(closed).toMatchObject({ ok: true, data: { status: "closed" } });
    expect(await auditFor(c.data.id, "study.close")).toHaveLength(1);
    const reopened = await updateStudy(ids.admin!, c.data.id, { status: "open", title: "Reopened study" });
    expect(reopened).toMatchObject({ ok: true, data: { status: "open", title: "Reopened study" } });
    expect(await auditFor(c.data.id, "study.reopen")).toHaveLength(1);
    const blank = await updateStudy(ids.admin!, c.data.id, { title: "  " });
    expect(blank.ok).toBe(false);
    if (!blank.ok) expect(blank.fieldErrors?.title).toBeDefined();
  });
});

describe("publishPlanVersion", () => {
  let studyId = 0;
  beforeAll(async () => {
    const c = await createStudy(ids.admin!, { slug: `plan-${tag}`, title: "Plan versions" });
    if (!c.ok) throw new Error(c.message);
    studyId = c.data.id;
  });

  test("a bad plan gives field errors keyed by the engine's dotted paths, and stores nothing", async () => {
    const plan = barley();
    const soil = plan.columns.findIndex((c) => c.name === "soil");
    const variety = plan.columns.findIndex((c) => c.name === "variety");
    plan.columns[soil] = { ...plan.columns[soil]!, baseline: "peat" };
    plan.columns[variety] = { ...plan.columns[variety]!, name: "soil" };
    plan.interactions = [["soil", "rainfall_cm"]];
    plan.thresholds = { vifWarning: 12, vifStrong: 10 };
    const r = await publishPlanVersion(ids.lead!, studyId, plan, "broken");
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.code).toBe("invalid");
    const fe = r.fieldErrors ?? {};
    expect(fe[`columns.${soil}.baseline`]?.[0]).toMatch(/"peat" is not among the levels/);
    expect(fe[`columns.${variety}.name`]?.[0]).toMatch(/already column/);
    expect(fe["interactions.0.1"]?.[0]).toMatch(/"rainfall_cm" is not a planned predictor/);
    expect(fe["thresholds.vifWarning"]?.[0]).toMatch(/above the strong-warning level/);
    expect(r.message).toMatch(/problems/);
    expect(await db.select().from(dataPlans).where(eq(dataPlans.studyId, studyId))).toHaveLength(0);
  });

  test("a plan without a response is an error on `columns`", async () => {
    const plan = barley();
    plan.columns = plan.columns.map((c) => (c.role === "response" ? { ...c, role: "carry" as const } : c));
    const r = await publishPlanVersion(ids.admin!, studyId, plan);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.fieldErrors?.columns?.[0]).toMatch(/exactly one response column; none is marked/);
  });

  test("version 1, the same plan again refused, a changed plan → version 2 and current, with audit rows", async () => {
    const v1 = await publishPlanVersion(ids.lead!, studyId, barley(), "first plan");
    expect(v1).toMatchObject({ ok: true, data: { version: 1, note: "first plan" } });
    if (!v1.ok) return;
    // the stored hash is the hash of the parsed plan (defaults filled), as the seed stores it
    const parsed = parsePlan(barley());
    if (!parsed.ok) throw new Error("demo plan invalid");
    expect(v1.data.planHash).toBe(planHash(parsed.plan));

    // same content, keys in another order: still the same plan
    const reordered = Object.fromEntries(Object.entries(barley()).reverse());
    const again = await publishPlanVersion(ids.lead!, studyId, reordered, "again");
    expect(again.ok).toBe(false);
    if (!again.ok) {
      expect(again.code).toBe("conflict");
      expect(again.message).toMatch(/same as the current version 1/);
    }

    const changed = barley();
    changed.interactions = [["nitrogen_kg_ha", "soil"]];
    const v2 = await publishPlanVersion(ids.admin!, studyId, changed, "nitrogen response by soil");
    expect(v2).toMatchObject({ ok: true, data: { version: 2 } });
    const [s] = await db
      .select({ v: studies.currentPlanVersion })
      .from(studies)
      .where(eq(studies.id, studyId));
    expect(s?.v).toBe(2);
    const versions = await db
      .select({ version: dataPlans.version, note: dataPlans.note, by: dataPlans.createdById })
      .from(dataPlans)
      .where(eq(dataPlans.studyId, studyId));
    expect(versions.sort((a, b) => a.version - b.version)).toEqual([
      { version: 1, note: "first plan", by: ids.lead },
      { version: 2, note: "nitrogen response by soil", by: ids.admin },
    ]);
    const audit = await auditFor(studyId, "plan.publish");
    expect(audit).toHaveLength(2);
    expect(audit[0]).toMatchObject({ actorId: ids.admin, before: { version: 1 }, after: { version: 2 } });
  });

  test("two publishers at the same moment get versions n+1 and n+2, never the same number", async () => {
    const a = barley();
    a.anticipatedR2 = 0.4;
    const b = barley();
    b.anticipatedR2 = 0.45;
    const [ra, rb] = await Promise.all([
      publishPlanVersion(ids.admin!, studyId, a),
      publishPlanVersion(ids.lead!, studyId, b),
    ]);
    expect(ra.ok && rb.ok).toBe(true);
    const got = [ra, rb].map((r) => (r.ok ? r.data.version : 0)).sort();
    expect(got).toEqual([3, 4]);
  });
});

describe("membership", () => {
  let studyId = 0;
  beforeAll(async () => {
    const c = await createStudy(ids.admin!, { slug: `members-${tag}`, title: "Membership" });
    if (!c.ok) throw new Error(c.message);
    studyId = c.data.id;
  });

  test("assign and unassign an analyst, admit and remove a provider, each with an audit row", async () => {
    expect(await assignAnalyst(ids.lead!, studyId, ids.analyst2)).toMatchObject({ ok: true });
    expect(await db.select().from(studyAnalysts).where(eq(studyAnalysts.studyId, studyId))).toHaveLength(1);
    const dup = await assignAnalyst(ids.lead!, studyId, ids.analyst2);
    expect(dup).toMatchObject({ ok: false, code: "conflict" });
    expect(await unassignAnalyst(ids.lead!, studyId, ids.analyst2)).toMatchObject({ ok: true });
    expect(await db.select().from(studyAnalysts).where(eq(studyAnalysts.studyId, studyId))).toHaveLength(0);

    expect(await admitProvider(ids.admin!, studyId, String(ids.fennick))).toMatchObject({
      ok: true,
      data: { name: "Fennick Hill Farm" },
    });
    expect(await db.select().from(studyProviders).where(eq(studyProviders.studyId, studyId))).toHaveLength(1);
    expect(await removeProvider(ids.admin!, studyId, ids.fennick)).toMatchObject({ ok: true });
    expect(await removeProvider(ids.admin!, studyId, ids.fennick)).toMatchObject({
      ok: false,
      code: "not_found",
    });

    const actions = (
      await db
        .select({ a: auditEvents.action, by: auditEvents.actorId })
        .from(auditEvents)
        .where(eq(auditEvents.studyId, studyId))
    ).map((r) => r.a);
    expect(actions.filter((a) => a !== "study.create").sort()).toEqual([
      "study.analyst_assign",
      "study.analyst_unassign",
      "study.provider_admit",
      "study.provider_remove",
    ]);
  });

  test("only active analysts are assigned, only provider organisations admitted", async () => {
    const notAnalyst = await assignAnalyst(ids.admin!, studyId, ids.provider);
    expect(notAnalyst.ok).toBe(false);
    if (!notAnalyst.ok) expect(notAnalyst.fieldErrors?.userId?.[0]).toMatch(/not an analyst/);
    const inactiveId = await userId("inactive@harrowgate.test");
    expect((await assignAnalyst(ids.admin!, studyId, inactiveId)).ok).toBe(false);
    const team = await admitProvider(ids.admin!, studyId, ids.team);
    expect(team.ok).toBe(false);
    if (!team.ok) expect(team.fieldErrors?.organisationId?.[0]).toMatch(/not a provider organisation/);
    const garbage = await admitProvider(ids.admin!, studyId, "farm");
    expect(garbage.ok).toBe(false);
    if (!garbage.ok) expect(garbage.fieldErrors?.organisationId).toBeDefined();
    expect(await db.select().from(studyProviders).where(eq(studyProviders.studyId, studyId))).toHaveLength(0);
  });

  test("a deactivated analyst cannot be assigned (the role and state are read from the database)", async () => {
    await db.update(users).set({ active: false }).where(eq(users.id, ids.analyst2!));
    try {
      const r = await assignAnalyst(ids.admin!, studyId, ids.analyst2);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.fieldErrors?.userId?.[0]).toMatch(/deactivated/);
    } finally {
      await db.update(users).set({ active: true }).where(eq(users.id, ids.analyst2!));
    }
  });
});

describe("refusals", () => {
  test.each(["provider", "analyst"])(
    "a %s calling any of the services → forbidden, nothing written",
    async (who) => {
      const actor = ids[who]!;
      const [barleyStudy] = await db
        .select({ id: studies.id, v: studies.currentPlanVersion })
        .from(studies)
        .where(eq(studies.slug, "barley-nitrogen"));
      const sid = barleyStudy!.id;
      const auditBefore = (await db.select({ id: auditEvents.id }).from(auditEvents)).length;
      const changed = barley();
      changed.anticipatedR2 = 0.5;
      const results = [
        await createStudy(actor, { slug: `refused-${who}-${tag}`, title: "Should not exist" }),
        await updateStudy(actor, sid, { status: "closed" }),
        await publishPlanVersion(actor, sid, changed),
        await assignAnalyst(actor, sid, ids.analyst2),
        await unassignAnalyst(actor, sid, ids.analyst),
        await admitProvider(actor, sid, ids.fennick),
        await removeProvider(actor, sid, ids.harrowgate),
      ];
      for (const r of results) expect(r).toMatchObject({ ok: false, code: "forbidden" });
      expect((await db.select({ id: auditEvents.id }).from(auditEvents)).length).toBe(auditBefore);
      const [after] = await db
        .select({ v: studies.currentPlanVersion, status: studies.status })
        .from(studies)
        .where(eq(studies.id, sid));
      expect(after).toEqual({ v: barleyStudy!.v, status: "open" });
    },
  );

  test("a lead demoted in the database is refused at once, whatever the session says", async () => {
    await db.update(users).set({ role: "analyst" }).where(eq(users.id, ids.lead!));
    try {
      expect(await createStudy(ids.lead!, { slug: `demoted-${tag}`, title: "After demotion" })).toMatchObject(
        { ok: false, code: "forbidden" },
      );
    } finally {
      await db.update(users).set({ role: "lead" }).where(eq(users.id, ids.lead!));
    }
  });
});
