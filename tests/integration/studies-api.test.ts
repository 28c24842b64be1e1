/**
 * GET /api/v1/studies/:id/plan — the current data plan with version and hash, scoped exactly
 * as the study pages: 401 anonymous, 404 for studies outside the caller's scope (a provider
 * organisation not admitted, an analyst not assigned), 404 for a study without a plan.
 * Demo accounts and studies as in README.md "Using Tributary, role by role".
 */
import { randomBytes } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));

import { getDb, getPool } from "@/db/client";
import { organisations, studies } from "@/db/schema";
import { GET as getPlan } from "@/app/api/v1/studies/[id]/plan/route";
import { BARLEY_PLAN } from "@/lib/demo/plans";
import { planHash } from "@/lib/demo/plan-hash";
import { parsePlan } from "@/lib/readiness";
import { admitProvider, createStudy, publishPlanVersion } from "@/lib/studies";
import { call, expectSafeError, type Caller } from "./helpers/api";
import { sessionCookieFor } from "./helpers/session";
import { seededUser } from "./helpers/seeded";

const db = getDb();
const as: Record<string, Caller> = {};
const userIds: Record<string, number> = {};
let barleyId = 0;

const EMAILS = {
  admin: "admin@tributary.test",
  lead: "lead@lowmoor.test",
  analyst: "analyst@lowmoor.test",
  analyst2: "analyst2@lowmoor.test",
  harrowgate: "provider@harrowgate.test",
  fennick: "provider@fennick.test",
  greenhearth: "installer@greenhearth.test",
};

beforeAll(async () => {
  for (const [key, email] of Object.entries(EMAILS)) {
    const u = await seededUser(email);
    userIds[key] = u.id;
    as[key] = { cookie: await sessionCookieFor(u) };
  }
  const [s] = await db.select({ id: studies.id }).from(studies).where(eq(studies.slug, "barley-nitrogen"));
  barleyId = s!.id;
});

afterAll(async () => {
  await getPool().end();
});

const get = (id: string | number, who?: keyof typeof EMAILS) =>
  call(getPlan, {
    path: `/api/v1/studies/${id}/plan`,
    params: { id: String(id) },
    as: who ? as[who] : undefined,
  });

describe("GET /api/v1/studies/:id/plan", () => {
  test("anonymous → 401", async () => {
    const r = await get("barley-nitrogen");
    expect(r.status).toBe(401);
    expectSafeError(r.json, "unauthenticated");
  });

  test("by slug and by number: version 1 of the seeded plan, with the hash of the parsed plan", async () => {
    const parsed = parsePlan(BARLEY_PLAN);
    if (!parsed.ok) throw new Error("demo plan invalid");
    for (const id of ["barley-nitrogen", barleyId]) {
      const r = await get(id, "admin");
      expect(r.status).toBe(200);
      const data = r.json.data as {
        studyId: number;
        slug: string;
        version: number;
        planHash: string;
        plan: { columns: { name: string }[] };
      };
      expect(data).toMatchObject({
        studyId: barleyId,
        slug: "barley-nitrogen",
        version: 1,
        planHash: planHash(parsed.plan),
      });
      expect(data.plan.columns.map((c) => c.name)).toEqual(BARLEY_PLAN.columns.map((c) => c.name));
    }
  });

  test.each([
    ["lead", "barley-nitrogen", 200],
    ["analyst", "barley-nitrogen", 200],
    ["harrowgate", "barley-nitrogen", 200],
    ["fennick", "barley-nitrogen", 200],
    // analyst2 is assigned to heat-pump-savings only; Greenhearth is admitted to heat-pump-savings only
    ["analyst2", "barley-nitrogen", 404],
    ["greenhearth", "barley-nitrogen", 404],
    ["harrowgate", "heat-pump-savings", 404],
    ["fennick", "heat-pump-savings", 404],
    ["greenhearth", "heat-pump-savings", 200],
    ["admin", "no-such-study", 404],
  ] as const)("%s → %s: %i", async (who, slug, status) => {
    const r = await get(slug, who);
    expect(r.status).toBe(status);
    if (status === 404) {
      expectSafeError(r.json, "not_found");
      expect(r.json.data).toBeUndefined();
    } else {
      expect((r.json.data as { slug: string }).slug).toBe(slug);
    }
  });

  test("a malformed id → 422 with what to send", async () => {
    const r = await get("bad id!", "admin");
    expect(r.status).toBe(422);
    expectSafeError(r.json, "invalid");
    expect(r.json.detail).toMatch(/number or its slug/);
  });

  test("a study without a plan → 404 that says so; after publishing, the newest version is served; admission opens it to the provider", async () => {
    const slug = `api-plan-${randomBytes(3).toString("hex")}`;
    const c = await createStudy(userIds.lead!, { slug, title: "API plan versions" });
    if (!c.ok) throw new Error(c.message);
    const none = await get(slug, "admin");
    expect(none.status).toBe(404);
    expect(none.json.detail).toMatch(/no data plan yet/);

    const v1 = await publishPlanVersion(userIds.lead!, c.data.id, BARLEY_PLAN);
    const changed = structuredClone(BARLEY_PLAN);
    changed.interactions = [["nitrogen_kg_ha", "irrigation_mm"]];
    const v2 = await publishPlanVersion(userIds.lead!, c.data.id, changed, "water interaction");
    if (!v1.ok || !v2.ok) throw new Error("publishing failed");
    const r = await get(c.data.id, "lead");
    expect(r.json.data).toMatchObject({ version: 2, planHash: v2.data.planHash, note: "water interaction" });
    expect((r.json.data as { plan: { interactions: string[][] } }).plan.interactions).toEqual([
      ["nitrogen_kg_ha", "irrigation_mm"],
    ]);

    // not admitted yet → 404; admitted → 200
    expect((await get(slug, "fennick")).status).toBe(404);
    const [fennick] = await db
      .select({ id: organisations.id })
      .from(organisations)
      .where(eq(organisations.slug, "fennick-hill"));
    expect((await admitProvider(userIds.admin!, c.data.id, fennick!.id)).ok).toBe(true);
    expect((await get(slug, "fennick")).status).toBe(200);
    expect((await get(slug, "harrowgate")).status).toBe(404);
  });
});
