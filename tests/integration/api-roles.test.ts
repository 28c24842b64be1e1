/**
 * One harness per role over the v1 API: what each role may read and do, and the refusals
 * (401 anonymous, 403 wrong role with the data unchanged, 404 outside scope) asserted as
 * firmly as the successes. Sessions are real next-auth cookies (helpers/session.ts).
 */
import { count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));

import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { GET as getMe } from "@/app/api/v1/me/route";
import { GET as listStudies } from "@/app/api/v1/studies/route";
import { GET as getStudy } from "@/app/api/v1/studies/[id]/route";
import { GET as listBatches } from "@/app/api/v1/batches/route";
import { GET as getBatch } from "@/app/api/v1/batches/[id]/route";
import { GET as listAdminUsers, POST as createAdminUser } from "@/app/api/v1/admin/users/route";
import { PATCH as patchAdminUser } from "@/app/api/v1/admin/users/[id]/route";
import { call, expectSafeError, type Caller } from "./helpers/api";
import { forgedSessionCookie, sessionCookieFor } from "./helpers/session";
import { createWorld, type World, type WorldUser } from "./helpers/world";

let w: World;
const as: Record<string, Caller> = {};

beforeAll(async () => {
  w = await createWorld();
  for (const [key, u] of Object.entries(w.users)) as[key] = { cookie: await sessionCookieFor(u) };
});

type Row = { id: number; organisationId?: number; publicId?: string };
const ids = (data: unknown) => (data as Row[]).map((r) => r.id);
const publicIds = (data: unknown) => (data as Row[]).map((r) => r.publicId);

/** A snapshot of the users table that a refused request must leave as it was. */
async function usersSnapshot() {
  const db = getDb();
  const [n] = await db.select({ n: count() }).from(users);
  const rows = await db
    .select({
      id: users.id,
      role: users.role,
      active: users.active,
      sessionVersion: users.sessionVersion,
      passwordHash: users.passwordHash,
    })
    .from(users)
    .where(eq(users.organisationId, w.farmB.id));
  return { count: Number(n?.n), farmB: rows };
}

function newUserBody(tag: string) {
  return {
    email: `new-${tag}-${Date.now()}@f3a.test`,
    name: "New Person",
    role: "admin",
    organisationId: w.team.id,
    password: "long-enough-password",
  };
}

describe("anonymous", () => {
  test.each([
    ["GET /api/v1/me", () => call(getMe, { path: "/api/v1/me" })],
    ["GET /api/v1/studies", () => call(listStudies, { path: "/api/v1/studies" })],
    [
      "GET /api/v1/studies/:id",
      () => call(getStudy, { path: `/api/v1/studies/${w.studyA.id}`, params: { id: String(w.studyA.id) } }),
    ],
    ["GET /api/v1/batches", () => call(listBatches, { path: "/api/v1/batches" })],
    [
      "GET /api/v1/batches/:id",
      () =>
        call(getBatch, { path: `/api/v1/batches/${w.batchA.publicId}`, params: { id: w.batchA.publicId } }),
    ],
    ["GET /api/v1/admin/users", () => call(listAdminUsers, { path: "/api/v1/admin/users" })],
  ])("%s → 401 JSON", async (_label, run) => {
    const res = await run();
    expect(res.status).toBe(401);
    expectSafeError(res.json, "unauthenticated");
    expect(res.json.data).toBeUndefined();
  });

  test("POST and PATCH on admin users → 401 and the users table unchanged", async () => {
    const before = await usersSnapshot();
    const created = await call(createAdminUser, {
      method: "POST",
      path: "/api/v1/admin/users",
      body: newUserBody("anon"),
    });
    const patched = await call(patchAdminUser, {
      method: "PATCH",
      path: `/api/v1/admin/users/${w.users.providerB.id}`,
      params: { id: String(w.users.providerB.id) },
      body: { active: false },
    });
    expect([created.status, patched.status]).toEqual([401, 401]);
    expect(await usersSnapshot()).toEqual(before);
  });

  test("a cookie encrypted under another secret, or a garbage cookie, is no session", async () => {
    const forged = await call(getMe, {
      path: "/api/v1/me",
      as: { cookie: await forgedSessionCookie(w.users.admin) },
    });
    const garbage = await call(getMe, {
      path: "/api/v1/me",
      as: { cookie: "next-auth.session-token=eyJhbGciOi.not.a.jwt" },
    });
    expect([forged.status, garbage.status]).toEqual([401, 401]);
  });
});

describe("provider", () => {
  test("sees itself and its organisation", async () => {
    const res = await call(getMe, { path: "/api/v1/me", as: as.providerA });
    expect(res.status).toBe(200);
    expect(res.json.data).toMatchObject({
      role: "provider",
      organisation: { id: w.farmA.id, name: w.farmA.name },
    });
    expect((res.json.data as { permissions: string[] }).permissions).not.toContain("user.manage");
  });

  test("lists exactly the studies its organisation is admitted to", async () => {
    const res = await call(listStudies, { path: "/api/v1/studies", as: as.providerA });
    expect(res.status).toBe(200);
    expect(ids(res.json.data)).toEqual([w.studyA.id]);
  });

  test("reads an admitted study, with only its own organisation among the providers", async () => {
    const res = await call(getStudy, {
      path: `/api/v1/studies/${w.studyA.slug}`,
      params: { id: w.studyA.slug },
      as: as.providerA,
    });
    expect(res.status).toBe(200);
    const study = res.json.data as {
      id: number;
      providers: { id: number }[];
      analysts: unknown[];
      currentPlan: { version: number };
    };
    expect(study.id).toBe(w.studyA.id);
    expect(study.providers.map((p) => p.id)).toEqual([w.farmA.id]);
    expect(study.analysts).toEqual([]);
    expect(study.currentPlan.version).toBe(1);
  });

  test("another study → 404, by id and by slug", async () => {
    for (const id of [String(w.studyB.id), w.studyB.slug]) {
      const res = await call(getStudy, { path: `/api/v1/studies/${id}`, params: { id }, as: as.providerA });
      expect(res.status).toBe(404);
      expectSafeError(res.json, "not_found");
    }
  });

  test("lists its own organisation's batches only", async () => {
    const res = await call(listBatches, { path: "/api/v1/batches", as: as.providerA });
    expect(res.status).toBe(200);
    const rows = res.json.data as Row[];
    expect(publicIds(rows)).toEqual([w.batchA.publicId]);
    expect(rows.every((r) => r.organisationId === w.farmA.id)).toBe(true);
  });

  test("reads its own batch with the latest version's state", async () => {
    const res = await call(getBatch, {
      path: `/api/v1/batches/${w.batchA.publicId}`,
      params: { id: w.batchA.publicId },
      as: as.providerA,
    });
    expect(res.status).toBe(200);
    expect(res.json.data).toMatchObject({
      publicId: w.batchA.publicId,
      state: "ready",
      latestVersion: 1,
      versions: [{ version: 1, state: "ready" }],
    });
  });

  test("another organisation's batch → 404, indistinguishable from a batch that does not exist", async () => {
    const other = await call(getBatch, {
      path: `/api/v1/batches/${w.batchB.publicId}`,
      params: { id: w.batchB.publicId },
      as: as.providerA,
    });
    const missing = await call(getBatch, {
      path: "/api/v1/batches/tnosuchbatch000",
      params: { id: "tnosuchbatch000" },
      as: as.providerA,
    });
    expect(other.status).toBe(404);
    expectSafeError(other.json, "not_found");
    // the same answer but for `instance`, which names the address asked (RFC 9457 §3.1.5)
    const same = (r: typeof other) => ({ status: r.status, json: { ...r.json, instance: undefined } });
    expect(same(other)).toEqual(same(missing));
    expect(other.json.instance).toBe(`/api/v1/batches/${w.batchB.publicId}`);
  });

  test("admin routes → 403, and the users table is unchanged", async () => {
    const before = await usersSnapshot();
    const list = await call(listAdminUsers, { path: "/api/v1/admin/users", as: as.providerA });
    const create = await call(createAdminUser, {
      method: "POST",
      path: "/api/v1/admin/users",
      body: newUserBody("prov"),
      as: as.providerA,
    });
    const deactivate = await call(patchAdminUser, {
      method: "PATCH",
      path: `/api/v1/admin/users/${w.users.providerB.id}`,
      params: { id: String(w.users.providerB.id) },
      body: { active: false },
      as: as.providerA,
    });
    // promoting oneself is refused the same way
    const promote = await call(patchAdminUser, {
      method: "PATCH",
      path: `/api/v1/admin/users/${w.users.providerA.id}`,
      params: { id: String(w.users.providerA.id) },
      body: { role: "admin" },
      as: as.providerA,
    });
    for (const res of [list, create, deactivate, promote]) {
      expect(res.status).toBe(403);
      expectSafeError(res.json, "forbidden");
    }
    expect(await usersSnapshot()).toEqual(before);
    const [me] = await getDb()
      .select({ role: users.role })
      .from(users)
      .where(eq(users.id, w.users.providerA.id));
    expect(me?.role).toBe("provider");
  });

  test("a refusal does not depend on the body: a malformed body still gets 403, not 422", async () => {
    const res = await call(createAdminUser, {
      method: "POST",
      path: "/api/v1/admin/users",
      body: "{not json",
      as: as.providerA,
    });
    expect(res.status).toBe(403);
  });
});

describe("analyst", () => {
  test("lists exactly the assigned studies", async () => {
    const a = await call(listStudies, { path: "/api/v1/studies", as: as.analystA });
    const b = await call(listStudies, { path: "/api/v1/studies", as: as.analystB });
    expect(ids(a.json.data)).toEqual([w.studyA.id]);
    expect(ids(b.json.data)).toEqual([w.studyB.id]);
  });

  test("an unassigned study → 404", async () => {
    const res = await call(getStudy, {
      path: `/api/v1/studies/${w.studyB.id}`,
      params: { id: String(w.studyB.id) },
      as: as.analystA,
    });
    expect(res.status).toBe(404);
    expectSafeError(res.json, "not_found");
  });

  test("an assigned study lists its analysts and providers", async () => {
    const res = await call(getStudy, {
      path: `/api/v1/studies/${w.studyA.id}`,
      params: { id: String(w.studyA.id) },
      as: as.analystA,
    });
    expect(res.status).toBe(200);
    const s = res.json.data as { analysts: { id: number }[]; providers: { id: number }[] };
    expect(s.analysts.map((a) => a.id)).toEqual([w.users.analystA.id]);
    expect(s.providers.map((p) => p.id)).toEqual([w.farmA.id]);
  });

  test("sees the batches of assigned studies only", async () => {
    const list = await call(listBatches, { path: "/api/v1/batches", as: as.analystA });
    expect(publicIds(list.json.data)).toEqual([w.batchA.publicId]);
    const own = await call(getBatch, {
      path: `/api/v1/batches/${w.batchA.publicId}`,
      params: { id: w.batchA.publicId },
      as: as.analystA,
    });
    const other = await call(getBatch, {
      path: `/api/v1/batches/${w.batchB.publicId}`,
      params: { id: w.batchB.publicId },
      as: as.analystA,
    });
    expect([own.status, other.status]).toEqual([200, 404]);
  });

  test("the batch list filters by study and state within scope", async () => {
    const filtered = await call(listBatches, {
      path: `/api/v1/batches?studyId=${w.studyB.id}`,
      as: as.analystA,
    });
    expect(filtered.json.data).toEqual([]);
    const ready = await call(listBatches, { path: "/api/v1/batches?state=ready", as: as.analystA });
    expect(publicIds(ready.json.data)).toEqual([w.batchA.publicId]);
    const bad = await call(listBatches, { path: "/api/v1/batches?state=lost", as: as.analystA });
    expect(bad.status).toBe(422);
    expect(bad.json.errors?.state?.[0]).toMatch(/state is one of: received, checking, ready/);
  });

  test("admin routes → 403", async () => {
    const res = await call(listAdminUsers, { path: "/api/v1/admin/users", as: as.analystA });
    expect(res.status).toBe(403);
  });
});

describe("lead", () => {
  test("sees every study and every batch", async () => {
    const studies = await call(listStudies, { path: "/api/v1/studies", as: as.lead });
    expect(ids(studies.json.data)).toEqual(expect.arrayContaining([w.studyA.id, w.studyB.id]));
    const batches = await call(listBatches, { path: "/api/v1/batches", as: as.lead });
    expect(publicIds(batches.json.data)).toEqual(
      expect.arrayContaining([w.batchA.publicId, w.batchB.publicId]),
    );
    const b = await call(getBatch, {
      path: `/api/v1/batches/${w.batchB.publicId}`,
      params: { id: w.batchB.publicId },
      as: as.lead,
    });
    expect(b.status).toBe(200);
  });

  test("admin user routes are for admins only → 403, data unchanged", async () => {
    const before = await usersSnapshot();
    const list = await call(listAdminUsers, { path: "/api/v1/admin/users", as: as.lead });
    const create = await call(createAdminUser, {
      method: "POST",
      path: "/api/v1/admin/users",
      body: newUserBody("lead"),
      as: as.lead,
    });
    expect([list.status, create.status]).toEqual([403, 403]);
    expect(await usersSnapshot()).toEqual(before);
  });
});

describe("admin", () => {
  test("sees every study and batch", async () => {
    const studies = await call(listStudies, { path: "/api/v1/studies", as: as.admin });
    expect(ids(studies.json.data)).toEqual(expect.arrayContaining([w.studyA.id, w.studyB.id]));
    const b = await call(getBatch, {
      path: `/api/v1/batches/${w.batchA.publicId}`,
      params: { id: w.batchA.publicId },
      as: as.admin,
    });
    expect(b.status).toBe(200);
  });

  test("lists users without any password hash", async () => {
    const res = await call(listAdminUsers, { path: "/api/v1/admin/users", as: as.admin });
    expect(res.status).toBe(200);
    const list = res.json.data as (WorldUser & { active: boolean })[];
    expect(list.map((u) => u.id)).toEqual(expect.arrayContaining(Object.values(w.users).map((u) => u.id)));
    expect(JSON.stringify(list)).not.toMatch(/hash|\$2[aby]\$/i);
  });
});
