/**
 * Sign-in throttling as the user meets it: the message the sign-in page shows for a
 * throttled attempt names the wait (the window of SIGN_IN_LIMIT); and a guesser who changes
 * X-Forwarded-For on every attempt — a header any client can send — is still stopped by the
 * per-account window. The windows are kept per app process (lib/auth/rate-limit.ts).
 */
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { getPool } from "@/db/client";
import { authorizeCredentials, clientIpOf } from "@/lib/auth/credentials";
import { resetSignInLimiter, SIGN_IN_LIMIT } from "@/lib/auth/rate-limit";
import { SIGN_IN_ERROR, signInErrorMessage } from "@/lib/auth/sign-in-errors";

const EMAIL = "analyst2@lowmoor.test";
const DEMO_PASSWORD = "tributary-demo";
const asFrom = (address: string) => ({ ip: clientIpOf({ "x-forwarded-for": address }) });

beforeEach(() => resetSignInLimiter());
afterAll(async () => {
  resetSignInLimiter();
  await getPool().end();
});

describe("sign-in throttling", () => {
  it("tells the user what happened and how long to wait", () => {
    const message = signInErrorMessage(SIGN_IN_ERROR.tooManyAttempts)!;
    expect(message).toMatch(/too many failed sign-ins/i);
    expect(message).toContain(`Wait ${SIGN_IN_LIMIT.windowMs / 60_000} minutes`);
    expect(message).toMatch(/ask an administrator to reset your password/);
  });

  it(`stops a guesser who changes X-Forwarded-For on every attempt after ${SIGN_IN_LIMIT.maxFailuresPerAccount} failures`, async () => {
    for (let i = 0; i < SIGN_IN_LIMIT.maxFailuresPerAccount; i++) {
      expect(await authorizeCredentials({ email: EMAIL, password: `guess-${i}-password` }, asFrom(`203.0.113.${i + 1}`))).toBeNull();
    }
    // even the right password, from an address never seen before, is refused until the window moves
    await expect(authorizeCredentials({ email: EMAIL, password: DEMO_PASSWORD }, asFrom("198.51.100.77"))).rejects.toThrow(SIGN_IN_ERROR.tooManyAttempts);
    // other accounts are not held back
    expect(await authorizeCredentials({ email: "analyst@lowmoor.test", password: DEMO_PASSWORD }, asFrom("203.0.113.1"))).not.toBeNull();
  });

  it("fewer failures spread over addresses do not lock the owner out", async () => {
    for (let i = 0; i < SIGN_IN_LIMIT.maxFailuresPerAccount - 1; i++) {
      await authorizeCredentials({ email: EMAIL, password: `guess-${i}-password` }, asFrom(`203.0.113.${i + 1}`));
    }
    expect(await authorizeCredentials({ email: EMAIL, password: DEMO_PASSWORD }, asFrom("198.51.100.77"))).toMatchObject({ email: EMAIL });
  });
});
