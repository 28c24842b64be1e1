/** User administration through the API and the services: every change in a transaction with its audit row. */
import { and, count, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));

import { getDb } from "@/db/client";
import { auditEvents, users } from "@/db/schema";
import { POST as createAdminUser } from "@/app/api/v1/admin/users/route";
import { PATCH as patchAdminUser } from "@/app/api/v1/admin/users/[id]/route";
import { authorizeCredentials } from "@/lib/auth/credentials";
import { changeRole, createUser, setActive } from "@/lib/people/commands-users";
import { call, expectSafeError } from "./helpers/api";
import { sessionCookieFor } from "./helpers/session";
import { createWorld, type World, type WorldUser } from "./helpers/world";

let w: World;
let admin: { cookie: string };

beforeAll(async () => {
  w = await createWorld();
  admin = { cookie: await sessionCookieFor(w.users.admin) };
});

const unique = (k: string) => `${k}-${Date.now()}-${Math.floor(Math.random() * 1e6)}@f3a.test`;

async function auditFor(objectId: number) {
  return getDb()
    .select({
      action: auditEvents.action,
      actorId: auditEvents.actorId,
      objectType: auditEvents.objectType,
      before: auditEvents.before,
      after: auditEvents.after,
    })
    .from(auditEvents)
    .where(and(eq(auditEvents.objectType, "user"), eq(auditEvents.objectId, String(objectId))))
    .orderBy(auditEvents.id);
}

function patch(target: number, body: unknown) {
  return call(patchAdminUser, {
    method: "PATCH",
    path: `/api/v1/admin/users/${target}`,
    params: { id: String(target) },
    body,
    as: admin,
  });
}

describe("POST /api/v1/admin/users", () => {
  test("creates a provider who can then sign in, with an audit row and no hash in the answer", async () => {
    const email = unique("created");
    const res = await call(createAdminUser, {
      method: "POST",
      path: "/api/v1/admin/users",
      body: {
        email: email.toUpperCase(),
        name: "Created Provider",
        role: "provider",
        organisationId: String(w.farmA.id),
        password: "a-long-password",
      },
      as: admin,
    });
    expect(res.status).toBe(201);
    const created = res.json.data as { id: number; email: string };
    expect(res.json.data).toEqual({
      id: created.id,
      email,
      name: "Created Provider",
      role: "provider",
      organisationId: w.farmA.id,
      active: true,
    });
    expect(
      await authorizeCredentials({ email, password: "a-long-password" }, { ip: "192.0.2.9" }),
    ).toMatchObject({ id: String(created.id), role: "provider" });
    expect(await auditFor(created.id)).toEqual([
      {
        action: "user.create",
        actorId: w.users.admin.id,
        objectType: "user",
        before: null,
        after: res.json.data,
      },
    ]);
  });

  test("a taken e-mail is a field error (409) and nothing is written", async () => {
    const [before] = await getDb().select({ n: count() }).from(users);
    const res = await call(createAdminUser, {
      method: "POST",
      path: "/api/v1/admin/users",
      body: {
        email: w.users.lead.email,
        name: "Twin",
        role: "analyst",
        organisationId: w.team.id,
        password: "a-long-password",
      },
      as: admin,
    });
    expect(res.status).toBe(409);
    expect(res.json.errors).toEqual({ email: ["An account with this e-mail already exists."] });
    const [after] = await getDb().select({ n: count() }).from(users);
    expect(after?.n).toBe(before?.n);
  });

  test.each([
    ["a bad e-mail", { email: "not-an-address" }, "email", /name@example\.org/],
    ["a short password", { password: "short" }, "password", /at least 10 characters/],
    ["an unknown role", { role: "owner" }, "role", /provider, analyst, lead, admin/],
    ["a missing name", { name: "" }, "name", /Enter a name/],
  ])("%s → 422 with a field error saying what to fix", async (_label, change, field, message) => {
    const body = {
      email: unique("bad"),
      name: "Someone",
      role: "analyst",
      organisationId: w.team.id,
      password: "a-long-password",
      ...change,
    };
    const res = await call(createAdminUser, { method: "POST", path: "/api/v1/admin/users", body, as: admin });
    expect(res.status).toBe(422);
    expect(res.json.errors?.[field]?.[0]).toMatch(message);
  });

  test.each([
    [
      "a provider without an organisation",
      { role: "provider", organisationId: "" },
      /Choose the provider organisation/,
    ],
    [
      "a provider in a team organisation",
      { role: "provider", organisationId: "team" },
      /provider organisation/,
    ],
    [
      "an analyst in a provider organisation",
      { role: "analyst", organisationId: "farm" },
      /team organisation/,
    ],
    [
      "an organisation that does not exist",
      { role: "analyst", organisationId: 999_999_999 },
      /no such organisation/,
    ],
  ])("%s → 422 on organisationId", async (_label, change, message) => {
    const organisationId =
      change.organisationId === "team"
        ? w.team.id
        : change.organisationId === "farm"
          ? w.farmA.id
          : change.organisationId;
    const body = {
      email: unique("org"),
      name: "Someone",
      password: "a-long-password",
      ...change,
      organisationId,
    };
    const res = await call(createAdminUser, { method: "POST", path: "/api/v1/admin/users", body, as: admin });
    expect(res.status).toBe(422);
    expect(res.json.errors?.organisationId?.[0]).toMatch(message);
  });

  test("a cookie-authenticated change from another site's page is refused and writes nothing", async () => {
    const email = unique("csrf");
    const body = JSON.stringify({
      email,
      name: "Cross Site",
      role: "admin",
      organisationId: w.team.id,
      password: "a-long-password",
    });
    const send = (origin: string) =>
      createAdminUser(
        new Request("http://127.0.0.1:3410/api/v1/admin/users", {
          method: "POST",
          headers: { cookie: admin.cookie, origin, "content-type": "application/json" },
          body,
        }),
        { params: Promise.resolve({}) },
      );
    const res = await send("http://evil.example");
    expect(res.status).toBe(403);
    expect(await getDb().select({ id: users.id }).from(users).where(eq(users.email, email))).toEqual([]);
    // our own origin is fine
    expect((await send("http://127.0.0.1:3410")).status).toBe(201);
  });

  test("a body that is not JSON → 400 with a plain message", async () => {
    const res = await call(createAdminUser, {
      method: "POST",
      path: "/api/v1/admin/users",
      body: "{email:",
      as: admin,
    });
    // a body that cannot be parsed at all is a 400 (RFC 9110 §15.5.1), not a validation error
    expect(res.status).toBe(400);
    expectSafeError(res.json, "bad_request");
    expect(res.json.detail).toMatch(/^The request body is not valid JSON\./);
  });
});

describe("PATCH /api/v1/admin/users/:id", () => {
  test("changes a role with an audit row holding before and after", async () => {
    const target = w.users.analystA;
    const res = await patch(target.id, { role: "lead" });
    expect(res.status).toBe(200);
    expect(res.json.data).toMatchObject({ id: target.id, role: "lead" });
    const [row] = await getDb().select({ role: users.role }).from(users).where(eq(users.id, target.id));
    expect(row?.role).toBe("lead");
    expect((await auditFor(target.id)).at(-1)).toEqual({
      action: "user.role_change",
      actorId: w.users.admin.id,
      objectType: "user",
      before: { role: "analyst" },
      after: { role: "lead" },
    });
    expect((await patch(target.id, { role: "analyst" })).status).toBe(200);
  });

  test("an unchanged value writes no audit row", async () => {
    const target = w.users.analystB;
    const before = (await auditFor(target.id)).length;
    expect((await patch(target.id, { role: "analyst", active: true })).status).toBe(200);
    expect((await auditFor(target.id)).length).toBe(before);
  });

  test.each([
    ["provider → analyst", () => w.users.providerA, { role: "analyst" }, 409, /provider organisation/],
    ["lead → provider", () => w.users.lead, { role: "provider" }, 409, /provider organisation/],
    ["own role", () => w.users.admin, { role: "lead" }, 409, /your own role/],
    ["own deactivation", () => w.users.admin, { active: false }, 409, /your own account/],
    ["an empty change", () => w.users.lead, {}, 422, /role, an active flag, or both/],
    ["a bad active flag", () => w.users.lead, { active: "maybe" }, 422, /active/],
  ])("%s is refused and changes nothing", async (_label, who, body, status, message) => {
    const target: WorldUser = who();
    const [before] = await getDb()
      .select({ role: users.role, active: users.active, sv: users.sessionVersion })
      .from(users)
      .where(eq(users.id, target.id));
    const auditBefore = (await auditFor(target.id)).length;
    const res = await patch(target.id, body);
    expect(res.status).toBe(status);
    expect(res.json.detail).toMatch(message);
    const [after] = await getDb()
      .select({ role: users.role, active: users.active, sv: users.sessionVersion })
      .from(users)
      .where(eq(users.id, target.id));
    expect(after).toEqual(before);
    expect((await auditFor(target.id)).length).toBe(auditBefore);
  });

  test("role and deactivation in one request: both applied, each with its audit row, and the session ends", async () => {
    const before = (
      await getDb().select({ sv: users.sessionVersion }).from(users).where(eq(users.id, w.users.analystB.id))
    )[0]!.sv;
    const ok = await patch(w.users.analystB.id, { role: "lead", active: false });
    expect(ok.status).toBe(200);
    const [row] = await getDb()
      .select({ role: users.role, active: users.active })
      .from(users)
      .where(eq(users.id, w.users.analystB.id));
    expect(row).toEqual({ role: "lead", active: false });
    const [after] = await getDb()
      .select({ sv: users.sessionVersion })
      .from(users)
      .where(eq(users.id, w.users.analystB.id));
    expect(after?.sv).toBe(before + 1);
    expect((await auditFor(w.users.analystB.id)).slice(-2).map((a) => a.action)).toEqual([
      "user.role_change",
      "user.deactivate",
    ]);
    expect((await patch(w.users.analystB.id, { role: "analyst", active: true })).status).toBe(200);
  });

  test("an unknown user → 404; a non-numeric id → 422", async () => {
    const missing = await patch(999_999_999, { active: false });
    expect(missing.status).toBe(404);
    const bad = await call(patchAdminUser, {
      method: "PATCH",
      path: "/api/v1/admin/users/abc",
      params: { id: "abc" },
      body: { active: false },
      as: admin,
    });
    expect(bad.status).toBe(422);
  });
});

describe("services read the actor's role from the database", () => {
  test("a lead may invite providers and analysts, not admins", async () => {
    const lead = w.users.lead.id;
    const provider = await createUser(lead, {
      email: unique("invited"),
      name: "Invited",
      role: "provider",
      organisationId: w.farmB.id,
      password: "a-long-password",
    });
    expect(provider.ok).toBe(true);
    const adminTry = await createUser(lead, {
      email: unique("boss"),
      name: "Boss",
      role: "admin",
      organisationId: w.team.id,
      password: "a-long-password",
    });
    expect(adminTry).toMatchObject({
      ok: false,
      code: "forbidden",
      fieldErrors: { role: ["Choose provider or analyst."] },
    });
    // leads do not manage roles or activation
    expect(await changeRole(lead, w.users.providerB.id, "provider")).toMatchObject({
      ok: false,
      code: "forbidden",
    });
    expect(await setActive(lead, w.users.providerB.id, false)).toMatchObject({
      ok: false,
      code: "forbidden",
    });
  });

  test("an actor deactivated after their page loaded can no longer act", async () => {
    const tmp = await createUser(w.users.admin.id, {
      email: unique("tmp-admin"),
      name: "Temp Admin",
      role: "admin",
      organisationId: null,
      password: "a-long-password",
    });
    if (!tmp.ok) throw new Error(tmp.message);
    expect((await setActive(w.users.admin.id, tmp.data.id, false)).ok).toBe(true);
    const res = await setActive(tmp.data.id, w.users.providerB.id, false);
    expect(res).toMatchObject({ ok: false, code: "unauthenticated" });
    const [row] = await getDb()
      .select({ active: users.active })
      .from(users)
      .where(eq(users.id, w.users.providerB.id));
    expect(row?.active).toBe(true);
  });
});

describe("GET /api/v1/audit", () => {
  test("leads and admins read the trail of a user; providers and analysts get 403", async () => {
    const { GET: listAudit } = await import("@/app/api/v1/audit/route");
    const target = w.users.providerA;
    expect((await patch(target.id, { active: false })).status).toBe(200);
    expect((await patch(target.id, { active: true })).status).toBe(200);
    const path = `/api/v1/audit?objectType=user&objectId=${target.id}`;
    const lead = await call(listAudit, { path, as: { cookie: await sessionCookieFor(w.users.lead) } });
    expect(lead.status).toBe(200);
    expect((lead.json.data as { action: string; actorName: string }[]).slice(0, 2)).toEqual([
      expect.objectContaining({ action: "user.reactivate", actorName: w.users.admin.name }),
      expect.objectContaining({ action: "user.deactivate", actorName: w.users.admin.name }),
    ]);
    for (const who of [w.users.providerB, w.users.analystA]) {
      const res = await call(listAudit, { path, as: { cookie: await sessionCookieFor(who) } });
      expect(res.status).toBe(403);
    }
    const bad = await call(listAudit, { path: "/api/v1/audit?limit=9999", as: admin });
    expect(bad.status).toBe(422);
  });
});
