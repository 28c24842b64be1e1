/** Signing in with e-mail and password: authorize(), the JWT it leads to, and throttling. */
import { eq } from "drizzle-orm";
import { beforeAll, beforeEach, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));

import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { authorizeCredentials, SignInRefused } from "@/lib/auth/credentials";
import { resetRateLimits, SIGN_IN_LIMIT } from "@/lib/auth/rate-limit";
import { SIGN_IN_ERROR, signInErrorMessage } from "@/lib/auth/sign-in-errors";
import { GET as getMe } from "@/app/api/v1/me/route";
import { call } from "./helpers/api";
import { jwtAtSignIn, sessionCookieFor } from "./helpers/session";
import { createWorld, WORLD_PASSWORD, type World } from "./helpers/world";

let w: World;
const ip = { ip: "203.0.113.7" };

beforeAll(async () => {
  w = await createWorld();
});
beforeEach(() => resetRateLimits());

describe("authorize()", () => {
  test("the right password signs in, with the session version of the row", async () => {
    const u = w.users.providerA;
    const got = await authorizeCredentials({ email: u.email, password: WORLD_PASSWORD }, ip);
    expect(got).toEqual({ id: String(u.id), email: u.email, name: u.name, role: "provider", sv: 1 });
  });

  test("e-mail is matched without regard to case and surrounding spaces", async () => {
    const u = w.users.lead;
    const got = await authorizeCredentials(
      { email: `  ${u.email.toUpperCase()} `, password: WORLD_PASSWORD },
      ip,
    );
    expect(got?.id).toBe(String(u.id));
  });

  test.each([
    ["a wrong password", (e: string) => ({ email: e, password: "wrong-password-123" })],
    ["an empty password", (e: string) => ({ email: e, password: "" })],
    ["an unknown e-mail", () => ({ email: "nobody@f3a.test", password: WORLD_PASSWORD })],
    ["no credentials", () => undefined],
    ["non-string values", (e: string) => ({ email: e, password: 12345 as unknown as string })],
  ])("%s is refused (null → next-auth's CredentialsSignin)", async (_label, make) => {
    expect(await authorizeCredentials(make(w.users.analystA.email), ip)).toBeNull();
  });

  test("a deactivated user is refused even with the right password", async () => {
    const u = w.users.providerB;
    await getDb().update(users).set({ active: false }).where(eq(users.id, u.id));
    try {
      const attempt = authorizeCredentials({ email: u.email, password: WORLD_PASSWORD }, ip);
      await expect(attempt).rejects.toBeInstanceOf(SignInRefused);
      await expect(authorizeCredentials({ email: u.email, password: WORLD_PASSWORD }, ip)).rejects.toThrow(
        SIGN_IN_ERROR.deactivated,
      );
      // and with a wrong password it is the plain refusal, which says nothing about the account
      expect(await authorizeCredentials({ email: u.email, password: "wrong-password-123" }, ip)).toBeNull();
    } finally {
      await getDb().update(users).set({ active: true }).where(eq(users.id, u.id));
    }
  });

  test("the sign-in page has a message for every refusal, and none for a crafted code", () => {
    const generic = signInErrorMessage("<b>Call 555-0100 for support</b>");
    expect(generic).toBe("Sign-in did not work. Try again.");
    const messages = Object.values(SIGN_IN_ERROR).map((code) => signInErrorMessage(code));
    for (const m of messages) expect(m).not.toBe(generic);
    expect(new Set(messages).size).toBe(messages.length);
    expect(signInErrorMessage(null)).toBeNull();
  });
});

describe("sign-in throttling", () => {
  test(`after ${SIGN_IN_LIMIT.maxFailures} failures the right password is refused too, for that e-mail and address only`, async () => {
    const u = w.users.analystB;
    for (let i = 0; i < SIGN_IN_LIMIT.maxFailures; i++) {
      expect(await authorizeCredentials({ email: u.email, password: `wrong-${i}-password` }, ip)).toBeNull();
    }
    await expect(authorizeCredentials({ email: u.email, password: WORLD_PASSWORD }, ip)).rejects.toThrow(
      SIGN_IN_ERROR.tooManyAttempts,
    );
    // another address is not held back by this one's failures
    expect(
      await authorizeCredentials({ email: u.email, password: WORLD_PASSWORD }, { ip: "198.51.100.20" }),
    ).not.toBeNull();
    // nor is another account from the same address
    expect(
      await authorizeCredentials({ email: w.users.lead.email, password: WORLD_PASSWORD }, ip),
    ).not.toBeNull();
  });

  test("the window is fixed: it ends 15 minutes after its first failure, and then nothing counts", async () => {
    const { checkSignInAllowed, recordSignInFailure } = await import("@/lib/auth/rate-limit");
    const t0 = Date.now();
    // only Date is faked: the limiter reads the time from Date.now() and stores the window's end
    vi.useFakeTimers({ toFake: ["Date"], now: t0 });
    try {
      for (let i = 0; i < SIGN_IN_LIMIT.maxFailures; i++) {
        vi.setSystemTime(t0 + i * 1000);
        await recordSignInFailure("x@f3a.test", "ip");
      }
      vi.setSystemTime(t0 + 10_000);
      const blocked = await checkSignInAllowed("x@f3a.test", "ip");
      expect(blocked.allowed).toBe(false);
      // the window opened at t0 and ends at t0 + 900 s: 890 s after t0 + 10 s
      expect(blocked.allowed === false && blocked.retryAfterSeconds).toBe(890);
      vi.setSystemTime(t0 + SIGN_IN_LIMIT.windowMs + 1);
      expect((await checkSignInAllowed("x@f3a.test", "ip")).allowed).toBe(true);
    } finally {
      vi.useRealTimers();
    }
  });

  test("nine failures then a success clears the count", async () => {
    const u = w.users.analystA;
    for (let i = 0; i < SIGN_IN_LIMIT.maxFailures - 1; i++)
      await authorizeCredentials({ email: u.email, password: "nope-nope-nope" }, ip);
    expect(await authorizeCredentials({ email: u.email, password: WORLD_PASSWORD }, ip)).not.toBeNull();
    for (let i = 0; i < SIGN_IN_LIMIT.maxFailures - 1; i++)
      await authorizeCredentials({ email: u.email, password: "nope-nope-nope" }, ip);
    expect(await authorizeCredentials({ email: u.email, password: WORLD_PASSWORD }, ip)).not.toBeNull();
  });
});

describe("from sign-in to an API call", () => {
  test("the JWT holds uid, role and sv, and its cookie opens /api/v1/me", async () => {
    const u = w.users.analystA;
    const token = await jwtAtSignIn(u);
    expect(token).toMatchObject({ uid: u.id, role: "analyst", sv: 1 });
    const res = await call(getMe, { path: "/api/v1/me", as: { cookie: await sessionCookieFor(u) } });
    expect(res.status).toBe(200);
    expect(res.json.data).toMatchObject({ id: u.id, email: u.email, role: "analyst", via: "session" });
    expect(JSON.stringify(res.json)).not.toMatch(/hash/i);
  });
});
