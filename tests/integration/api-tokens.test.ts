/** API tokens: Bearer access as the token's user, revocation, last use, and what a token may not do. */
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));

import { getDb } from "@/db/client";
import { apiTokens, auditEvents, users } from "@/db/schema";
import { GET as getMe } from "@/app/api/v1/me/route";
import { GET as getBatch } from "@/app/api/v1/batches/[id]/route";
import { GET as listTokens, POST as createToken } from "@/app/api/v1/tokens/route";
import { DELETE as revokeToken } from "@/app/api/v1/tokens/[id]/route";
import { hashApiToken } from "@/lib/auth/api-tokens";
import { call, expectSafeError } from "./helpers/api";
import { sessionCookieFor } from "./helpers/session";
import { addApiToken, createWorld, type World } from "./helpers/world";

let w: World;

beforeAll(async () => {
  w = await createWorld();
});

describe("API tokens", () => {
  test("created while signed in, shown once, stored only as its sha-256, and usable as Bearer", async () => {
    const u = w.users.providerA;
    const cookie = await sessionCookieFor(u);
    const created = await call(createToken, {
      method: "POST",
      path: "/api/v1/tokens",
      body: { name: "upload script" },
      as: { cookie },
    });
    expect(created.status).toBe(201);
    const { token, id, prefix } = created.json.data as { token: string; id: number; prefix: string };
    expect(token).toMatch(/^trb_[A-Za-z0-9_-]{32}$/);
    expect(token.startsWith(prefix)).toBe(true);

    const [row] = await getDb()
      .select({ tokenHash: apiTokens.tokenHash, lastUsedAt: apiTokens.lastUsedAt })
      .from(apiTokens)
      .where(eq(apiTokens.id, id));
    expect(row?.tokenHash).toBe(hashApiToken(token));
    expect(row?.tokenHash).not.toContain(token.slice(4, 20));
    expect(row?.lastUsedAt).toBeNull();

    const me = await call(getMe, { path: "/api/v1/me", as: { bearer: token } });
    expect(me.status).toBe(200);
    expect(me.json.data).toMatchObject({ id: u.id, role: "provider", via: "token" });
    const [used] = await getDb()
      .select({ lastUsedAt: apiTokens.lastUsedAt })
      .from(apiTokens)
      .where(eq(apiTokens.id, id));
    expect(used?.lastUsedAt).toBeInstanceOf(Date);
    expect(Math.abs(used!.lastUsedAt!.getTime() - Date.now())).toBeLessThan(60_000);

    // the list never shows the token again
    const list = await call(listTokens, { path: "/api/v1/tokens", as: { cookie } });
    expect(JSON.stringify(list.json)).not.toContain(token);
    expect(JSON.stringify(list.json)).not.toContain(row!.tokenHash);
    expect((list.json.data as { id: number }[]).map((t) => t.id)).toContain(id);
  });

  test("a token carries its user's scope: another organisation's batch is still 404", async () => {
    const { token } = await addApiToken(w.users.providerA);
    const own = await call(getBatch, {
      path: `/api/v1/batches/${w.batchA.publicId}`,
      params: { id: w.batchA.publicId },
      as: { bearer: token },
    });
    const other = await call(getBatch, {
      path: `/api/v1/batches/${w.batchB.publicId}`,
      params: { id: w.batchB.publicId },
      as: { bearer: token },
    });
    expect([own.status, other.status]).toEqual([200, 404]);
  });

  test("a revoked token is refused with 401 and says so", async () => {
    const u = w.users.analystA;
    const cookie = await sessionCookieFor(u);
    const { id, token } = await addApiToken(u);
    expect((await call(getMe, { path: "/api/v1/me", as: { bearer: token } })).status).toBe(200);

    const revoked = await call(revokeToken, {
      method: "DELETE",
      path: `/api/v1/tokens/${id}`,
      params: { id: String(id) },
      as: { cookie },
    });
    expect(revoked.status).toBe(200);
    const res = await call(getMe, { path: "/api/v1/me", as: { bearer: token } });
    expect(res.status).toBe(401);
    expectSafeError(res.json, "unauthenticated");
    expect(res.json.detail).toMatch(/revoked/);

    const audit = await getDb()
      .select({ action: auditEvents.action })
      .from(auditEvents)
      .where(eq(auditEvents.objectId, String(id)));
    expect(audit.map((a) => a.action)).toContain("token.revoke");
  });

  test("a token inserted as revoked, an unknown token, a session JWT sent as Bearer, and a non-Bearer scheme are all 401", async () => {
    const { token: revoked } = await addApiToken(w.users.lead, { revoked: true });
    const jwt = (await sessionCookieFor(w.users.lead)).split("=")[1]!;
    for (const bearer of [revoked, "trb_thisTokenWasNeverIssued000000000", jwt]) {
      const res = await call(getMe, { path: "/api/v1/me", as: { bearer } });
      expect(res.status).toBe(401);
    }
    const basic = await getMe(
      new Request("http://127.0.0.1:3410/api/v1/me", { headers: { authorization: "Basic YTpi" } }),
      { params: Promise.resolve({}) },
    );
    expect(basic.status).toBe(401);
  });

  test("a deactivated user's token stops working", async () => {
    const u = w.users.providerB;
    const { token } = await addApiToken(u);
    expect((await call(getMe, { path: "/api/v1/me", as: { bearer: token } })).status).toBe(200);
    await getDb().update(users).set({ active: false }).where(eq(users.id, u.id));
    try {
      const res = await call(getMe, { path: "/api/v1/me", as: { bearer: token } });
      expect(res.status).toBe(401);
      expect(res.json.detail).toMatch(/not active/);
    } finally {
      await getDb().update(users).set({ active: true }).where(eq(users.id, u.id));
    }
  });

  test("a token cannot mint tokens, nor revoke another user's token", async () => {
    const { token } = await addApiToken(w.users.lead);
    const mint = await call(createToken, {
      method: "POST",
      path: "/api/v1/tokens",
      body: { name: "chain" },
      as: { bearer: token },
    });
    expect(mint.status).toBe(403);

    const theirs = await addApiToken(w.users.analystB);
    const res = await call(revokeToken, {
      method: "DELETE",
      path: `/api/v1/tokens/${theirs.id}`,
      params: { id: String(theirs.id) },
      as: { cookie: await sessionCookieFor(w.users.lead) },
    });
    expect(res.status).toBe(404);
    expect((await call(getMe, { path: "/api/v1/me", as: { bearer: theirs.token } })).status).toBe(200);
  });

  test("a token needs a name", async () => {
    const res = await call(createToken, {
      method: "POST",
      path: "/api/v1/tokens",
      body: { name: "  " },
      as: { cookie: await sessionCookieFor(w.users.lead) },
    });
    expect(res.status).toBe(422);
    expect(res.json.errors?.name).toEqual(["Name the token (e.g. 'upload script')."]);
  });
});
