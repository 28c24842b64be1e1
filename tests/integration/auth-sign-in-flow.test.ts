/**
 * The whole next-auth v4 sign-in with our authOptions: CSRF token, credentials callback,
 * session cookie, session read, refusals. Driven through NextAuth's request/response entry
 * (the pages-API form), which hands each request to the same core as the App Router route
 * app/api/auth/[...nextauth]; outside Next there is no request scope for next/headers,
 * which is all the App Router form adds.
 */
import { eq } from "drizzle-orm";
import { beforeAll, beforeEach, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));

import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { GET as getMe } from "@/app/api/v1/me/route";
import { authOptions } from "@/lib/auth/options";
import { resetRateLimits, SIGN_IN_LIMIT } from "@/lib/auth/rate-limit";
import { call } from "./helpers/api";
import { callNextAuth, type Jar } from "./helpers/next-auth";
import { SESSION_COOKIE } from "./helpers/session";
import { createWorld, WORLD_PASSWORD, type World } from "./helpers/world";

let w: World;
const HEADERS = { host: "127.0.0.1:3410", "x-forwarded-for": "192.0.2.44" };

beforeAll(async () => {
  w = await createWorld();
});
beforeEach(() => resetRateLimits());

/** One request to next-auth as the browser at 127.0.0.1:3410 would send it. */
function nextAuth(
  action: string[],
  method: "GET" | "POST",
  jar: Jar,
  body?: Record<string, string>,
  query: Record<string, string> = {},
) {
  return callNextAuth(authOptions, action, method, jar, body, { query, headers: HEADERS });
}

async function signIn(email: string, password: string, opts: { csrf?: boolean } = {}) {
  const jar: Jar = {};
  const csrf = await nextAuth(["csrf"], "GET", jar);
  const csrfToken = (csrf.body as { csrfToken: string }).csrfToken;
  expect(csrfToken).toMatch(/^[0-9a-f]{64}$/);
  const res = await nextAuth(["callback", "credentials"], "POST", jar, {
    email,
    password,
    ...(opts.csrf === false ? {} : { csrfToken }),
    callbackUrl: "/",
    json: "true",
  });
  return { res, jar, session: jar[SESSION_COOKIE] };
}

describe("sign-in through next-auth", () => {
  test("the right password sets a session cookie that the API and the session endpoint accept", async () => {
    const u = w.users.providerA;
    const { res, session, jar } = await signIn(u.email, WORLD_PASSWORD);
    expect(session).toBeTruthy();
    expect(res.redirect).toBe("http://127.0.0.1:3410/");

    const me = await call(getMe, { path: "/api/v1/me", as: { cookie: `${SESSION_COOKIE}=${session}` } });
    expect(me.status).toBe(200);
    expect(me.json.data).toMatchObject({ id: u.id, role: "provider", organisation: { id: w.farmA.id } });

    const s = await nextAuth(["session"], "GET", jar);
    expect(s.body).toMatchObject({ user: { id: u.id, email: u.email, role: "provider" }, sv: 1 });

    // signing out clears the cookie
    const csrf = (await nextAuth(["csrf"], "GET", jar)).body as { csrfToken: string };
    await nextAuth(["signout"], "POST", jar, { csrfToken: csrf.csrfToken, json: "true" });
    expect(jar[SESSION_COOKIE]).toBeUndefined();
  });

  test("a wrong password gives CredentialsSignin and no session cookie", async () => {
    const { res, session, jar } = await signIn(w.users.lead.email, "wrong-password-000");
    expect(session).toBeUndefined();
    // next-auth sends a null authorize() through its own error route, which forwards to our page
    const to = new URL(res.redirect!);
    expect(to.pathname).toBe("/api/auth/error");
    expect(to.searchParams.get("error")).toBe("CredentialsSignin");
    const hop1 = new URL(
      (await nextAuth(["error"], "GET", jar, undefined, { error: "CredentialsSignin" })).redirect!,
    );
    expect(hop1.pathname).toBe("/api/auth/signin");
    const hop2 = await nextAuth(["signin"], "GET", jar, undefined, Object.fromEntries(hop1.searchParams));
    const page = new URL(hop2.redirect!, "http://127.0.0.1:3410");
    expect([page.pathname, page.searchParams.get("error")]).toEqual(["/sign-in", "CredentialsSignin"]);
  });

  test("a deactivated account gives AccountDeactivated and no session cookie", async () => {
    const u = w.users.providerB;
    await getDb().update(users).set({ active: false }).where(eq(users.id, u.id));
    try {
      const { res, session } = await signIn(u.email, WORLD_PASSWORD);
      expect(session).toBeUndefined();
      expect(new URL(res.redirect!).searchParams.get("error")).toBe("AccountDeactivated");
    } finally {
      await getDb().update(users).set({ active: true }).where(eq(users.id, u.id));
    }
  });

  test(`after ${SIGN_IN_LIMIT.maxFailures} failures from one address the form answers TooManyAttempts`, async () => {
    const u = w.users.analystA;
    for (let i = 0; i < SIGN_IN_LIMIT.maxFailures; i++) await signIn(u.email, `wrong-${i}-password`);
    const { res, session } = await signIn(u.email, WORLD_PASSWORD);
    expect(session).toBeUndefined();
    expect(new URL(res.redirect!).searchParams.get("error")).toBe("TooManyAttempts");
  });

  test("a sign-in without the CSRF token is refused", async () => {
    const { res, session } = await signIn(w.users.lead.email, WORLD_PASSWORD, { csrf: false });
    expect(session).toBeUndefined();
    expect(res.redirect).toContain("csrf=true");
  });
});
