/**
 * Open sessions end when they should: deactivation and a password change end them at the
 * next request; a role change bites at once because the role is read from the database.
 */
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));
const { getServerSessionMock, redirectMock } = vi.hoisted(() => ({
  getServerSessionMock: vi.fn(),
  redirectMock: vi.fn((url: string) => {
    throw new Error(`NEXT_REDIRECT ${url}`);
  }),
}));
// getCurrentUser() reads the session through next-auth's getServerSession, which needs
// Next's request scope; here it is handed the session next-auth would have decoded.
vi.mock("next-auth", async (orig) => ({
  ...(await orig<typeof import("next-auth")>()),
  getServerSession: getServerSessionMock,
}));
vi.mock("next/navigation", () => ({ redirect: redirectMock }));

import { getDb } from "@/db/client";
import { auditEvents, users } from "@/db/schema";
import { GET as getMe } from "@/app/api/v1/me/route";
import { GET as listStudies } from "@/app/api/v1/studies/route";
import { GET as listAdminUsers } from "@/app/api/v1/admin/users/route";
import { PATCH as patchAdminUser } from "@/app/api/v1/admin/users/[id]/route";
import { authorizeCredentials } from "@/lib/auth/credentials";
import { authOptions } from "@/lib/auth/options";
import { getCurrentUser, requireUser } from "@/lib/auth/session";
import { changeOwnPassword } from "@/lib/people/commands-users";
import { call, expectSafeError } from "./helpers/api";
import { jwtAtSignIn, sessionCookieFor } from "./helpers/session";
import { createWorld, WORLD_PASSWORD, type World, type WorldUser } from "./helpers/world";

let w: World;
let adminCookie: string;

beforeAll(async () => {
  w = await createWorld();
  adminCookie = await sessionCookieFor(w.users.admin);
});

async function sessionVersionOf(id: number): Promise<number> {
  const [row] = await getDb().select({ sv: users.sessionVersion }).from(users).where(eq(users.id, id));
  return row!.sv;
}

function patchUser(target: WorldUser, body: unknown) {
  return call(patchAdminUser, {
    method: "PATCH",
    path: `/api/v1/admin/users/${target.id}`,
    params: { id: String(target.id) },
    body,
    as: { cookie: adminCookie },
  });
}

/** The session object next-auth builds from the JWT with our session callback. */
async function sessionFor(user: WorldUser) {
  const token = await jwtAtSignIn(user);
  return authOptions.callbacks!.session!({
    session: { expires: new Date(Date.now() + 3600_000).toISOString() } as never,
    token,
  } as never);
}

describe("deactivation", () => {
  test("a deactivated user's open session gets 401 at its next request, and stays ended after reactivation", async () => {
    const u = w.users.providerB;
    const cookie = await sessionCookieFor(u);
    expect((await call(getMe, { path: "/api/v1/me", as: { cookie } })).status).toBe(200);

    const off = await patchUser(u, { active: false });
    expect(off.status).toBe(200);
    expect(off.json.data).toMatchObject({ id: u.id, active: false });
    expect(await sessionVersionOf(u.id)).toBe(2);

    const after = await call(getMe, { path: "/api/v1/me", as: { cookie } });
    expect(after.status).toBe(401);
    expectSafeError(after.json, "unauthenticated");

    // the deactivated user cannot sign in again either
    await expect(
      authorizeCredentials({ email: u.email, password: WORLD_PASSWORD }, { ip: "192.0.2.1" }),
    ).rejects.toThrow("AccountDeactivated");

    // reactivation lets them sign in anew, but the old session stays ended
    expect((await patchUser(u, { active: true })).status).toBe(200);
    expect((await call(getMe, { path: "/api/v1/me", as: { cookie } })).status).toBe(401);
    const fresh = await authorizeCredentials(
      { email: u.email, password: WORLD_PASSWORD },
      { ip: "192.0.2.1" },
    );
    expect(fresh?.sv).toBe(2);
    expect(
      (
        await call(getMe, {
          path: "/api/v1/me",
          as: { cookie: await sessionCookieFor({ ...u, sessionVersion: 2 }) },
        })
      ).status,
    ).toBe(200);

    const audit = await getDb()
      .select({
        action: auditEvents.action,
        actorId: auditEvents.actorId,
        before: auditEvents.before,
        after: auditEvents.after,
      })
      .from(auditEvents)
      .where(eq(auditEvents.objectId, String(u.id)));
    expect(audit.filter((a) => a.action.startsWith("user.") && a.actorId === w.users.admin.id)).toEqual([
      {
        action: "user.deactivate",
        actorId: w.users.admin.id,
        before: { active: true },
        after: { active: false },
      },
      {
        action: "user.reactivate",
        actorId: w.users.admin.id,
        before: { active: false },
        after: { active: true },
      },
    ]);
  });

  test("getCurrentUser() gives the user, then null once deactivated; requireUser() then redirects to /sign-in", async () => {
    const u = w.users.analystB;
    getServerSessionMock.mockResolvedValue(await sessionFor(u));
    expect(await getCurrentUser()).toEqual({
      id: u.id,
      email: u.email,
      name: u.name,
      role: "analyst",
      organisationId: w.team.id,
      organisationName: expect.stringContaining("Test Team"),
    });
    expect(Object.keys((await getCurrentUser()) ?? {})).not.toContain("passwordHash");

    await getDb().update(users).set({ active: false }).where(eq(users.id, u.id));
    try {
      expect(await getCurrentUser()).toBeNull();
      await expect(requireUser()).rejects.toThrow("NEXT_REDIRECT /sign-in");
      expect(redirectMock).toHaveBeenCalledWith("/sign-in");
    } finally {
      await getDb().update(users).set({ active: true }).where(eq(users.id, u.id));
    }
    getServerSessionMock.mockResolvedValue(null);
    expect(await getCurrentUser()).toBeNull();
  });
});

describe("password change", () => {
  test("ends every older session; the new password signs in and the old one no longer does", async () => {
    const u = w.users.analystA;
    const cookie = await sessionCookieFor(u);
    expect((await call(getMe, { path: "/api/v1/me", as: { cookie } })).status).toBe(200);

    const wrong = await changeOwnPassword(u.id, "not-my-password", "a-brand-new-password");
    expect(wrong).toEqual({
      ok: false,
      message: "Check the highlighted fields.",
      fieldErrors: { currentPassword: ["That is not your current password."] },
      code: "invalid",
    });
    const short = await changeOwnPassword(u.id, WORLD_PASSWORD, "short");
    expect(short.ok === false && short.fieldErrors?.newPassword).toEqual(["Use at least 10 characters."]);
    const mismatch = await changeOwnPassword(
      u.id,
      WORLD_PASSWORD,
      "a-brand-new-password",
      "a-brand-new-passwort",
    );
    expect(mismatch.ok === false && mismatch.fieldErrors?.confirmPassword?.[0]).toMatch(/differ/);
    // refused attempts change nothing
    expect((await call(getMe, { path: "/api/v1/me", as: { cookie } })).status).toBe(200);
    expect(await sessionVersionOf(u.id)).toBe(1);

    const done = await changeOwnPassword(
      u.id,
      WORLD_PASSWORD,
      "a-brand-new-password",
      "a-brand-new-password",
    );
    expect(done).toEqual({ ok: true, data: { sessionVersion: 2 } });
    expect((await call(getMe, { path: "/api/v1/me", as: { cookie } })).status).toBe(401);

    expect(
      await authorizeCredentials({ email: u.email, password: WORLD_PASSWORD }, { ip: "192.0.2.2" }),
    ).toBeNull();
    const again = await authorizeCredentials(
      { email: u.email, password: "a-brand-new-password" },
      { ip: "192.0.2.2" },
    );
    expect(again).toMatchObject({ id: String(u.id), sv: 2 });
    const newCookie = await sessionCookieFor({ ...u, sessionVersion: again!.sv });
    expect((await call(getMe, { path: "/api/v1/me", as: { cookie: newCookie } })).status).toBe(200);

    const [audit] = await getDb()
      .select({ actorId: auditEvents.actorId, before: auditEvents.before, after: auditEvents.after })
      .from(auditEvents)
      .where(and(eq(auditEvents.action, "user.password_change"), eq(auditEvents.objectId, String(u.id))));
    expect(audit).toMatchObject({
      actorId: u.id,
      before: { sessionVersion: 1 },
      after: { sessionVersion: 2 },
    });
    expect(JSON.stringify(audit)).not.toMatch(/\$2[aby]\$|password/i);
  });
});

describe("password change throttling", () => {
  test("ten wrong current passwords block the eleventh attempt, even a right one", async () => {
    const u = w.users.lead;
    for (let i = 0; i < 10; i++) {
      const r = await changeOwnPassword(u.id, `wrong-current-${i}`, "another-new-password");
      expect(r.ok === false && r.fieldErrors?.currentPassword).toBeTruthy();
    }
    const blocked = await changeOwnPassword(u.id, WORLD_PASSWORD, "another-new-password");
    // the limit is the shared rate limiter's (README "Limits"): the API answers it with 429
    expect(blocked).toMatchObject({
      ok: false,
      code: "rate_limited",
      message: expect.stringMatching(/Too many wrong current passwords/),
    });
    expect(await sessionVersionOf(u.id)).toBe(1);
  });
});

describe("role change", () => {
  test("bites at the next request although the session still says the old role", async () => {
    const u = w.users.analystB;
    const cookie = await sessionCookieFor(u); // the JWT says "analyst"
    expect((await call(listAdminUsers, { path: "/api/v1/admin/users", as: { cookie } })).status).toBe(403);
    const onlyB = await call(listStudies, { path: "/api/v1/studies", as: { cookie } });
    expect((onlyB.json.data as { id: number }[]).map((s) => s.id)).toEqual([w.studyB.id]);

    expect((await patchUser(u, { role: "admin" })).status).toBe(200);
    try {
      expect((await call(listAdminUsers, { path: "/api/v1/admin/users", as: { cookie } })).status).toBe(200);
      const all = await call(listStudies, { path: "/api/v1/studies", as: { cookie } });
      expect((all.json.data as { id: number }[]).map((s) => s.id)).toEqual(
        expect.arrayContaining([w.studyA.id, w.studyB.id]),
      );
    } finally {
      expect((await patchUser(u, { role: "analyst" })).status).toBe(200);
    }
    expect((await call(listAdminUsers, { path: "/api/v1/admin/users", as: { cookie } })).status).toBe(403);
  });
});
