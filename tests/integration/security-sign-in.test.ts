/**
 * Sign-in throttling as the user meets it: the message the sign-in page shows for a
 * throttled attempt names the wait (the window of SIGN_IN_LIMIT); and a guesser who changes
 * X-Forwarded-For on every attempt — a header any client can send — is still stopped by the
 * per-account window. The windows are counted in the database (lib/auth/rate-limit.ts), with
 * nothing evicted: the regression of the in-memory limiter, where 5,000 failures on made-up
 * e-mails pushed a locked account's window out of a full map and unlocked it, is tested here.
 */
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { getPool } from "@/db/client";
import { authorizeCredentials, clientIpOf } from "@/lib/auth/credentials";
import { recordSignInFailure, resetRateLimits, SIGN_IN_LIMIT } from "@/lib/auth/rate-limit";
import { SIGN_IN_ERROR, signInErrorMessage } from "@/lib/auth/sign-in-errors";

const EMAIL = "analyst2@lowmoor.test";
const DEMO_PASSWORD = "tributary-demo";
const asFrom = (address: string) => ({ ip: clientIpOf({ "x-forwarded-for": address }) });

beforeEach(() => resetRateLimits());
afterAll(async () => {
  await resetRateLimits();
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
      expect(
        await authorizeCredentials(
          { email: EMAIL, password: `guess-${i}-password` },
          asFrom(`203.0.113.${i + 1}`),
        ),
      ).toBeNull();
    }
    // even the right password, from an address never seen before, is refused until the window moves
    await expect(
      authorizeCredentials({ email: EMAIL, password: DEMO_PASSWORD }, asFrom("198.51.100.77")),
    ).rejects.toThrow(SIGN_IN_ERROR.tooManyAttempts);
    // other accounts are not held back
    expect(
      await authorizeCredentials(
        { email: "analyst@lowmoor.test", password: DEMO_PASSWORD },
        asFrom("203.0.113.1"),
      ),
    ).not.toBeNull();
  });

  it("fewer failures spread over addresses do not lock the owner out", async () => {
    for (let i = 0; i < SIGN_IN_LIMIT.maxFailuresPerAccount - 1; i++) {
      await authorizeCredentials(
        { email: EMAIL, password: `guess-${i}-password` },
        asFrom(`203.0.113.${i + 1}`),
      );
    }
    expect(
      await authorizeCredentials({ email: EMAIL, password: DEMO_PASSWORD }, asFrom("198.51.100.77")),
    ).toMatchObject({ email: EMAIL });
  });

  it("a locked account stays locked after 5,000 failures on made-up e-mails (they cannot push its counter out)", async () => {
    for (let i = 0; i < SIGN_IN_LIMIT.maxFailuresPerAccount; i++) {
      await authorizeCredentials(
        { email: EMAIL, password: `guess-${i}-password` },
        asFrom(`203.0.113.${i + 1}`),
      );
    }
    await expect(
      authorizeCredentials({ email: EMAIL, password: DEMO_PASSWORD }, asFrom("198.51.100.77")),
    ).rejects.toThrow(SIGN_IN_ERROR.tooManyAttempts);
    // the flood goes to the limiter directly (the password check of each attempt would only add time)
    const FLOOD = 5_000;
    for (let start = 0; start < FLOOD; start += 50) {
      await Promise.all(
        Array.from({ length: 50 }, (_, j) => {
          const n = start + j;
          return recordSignInFailure(
            `made-up-${n}@nowhere.test`,
            `10.${(n >> 16) & 255}.${(n >> 8) & 255}.${n & 255}`,
          );
        }),
      );
    }
    const [rows] = (await getPool().query(
      "SELECT COUNT(*) AS n FROM rate_limits WHERE `key` LIKE 'signInAccount:%'",
    )) as unknown as [{ n: number }[]];
    expect(Number(rows[0]!.n)).toBe(FLOOD + 1);
    await expect(
      authorizeCredentials({ email: EMAIL, password: DEMO_PASSWORD }, asFrom("198.51.100.78")),
    ).rejects.toThrow(SIGN_IN_ERROR.tooManyAttempts);
  }, 600_000);
});
