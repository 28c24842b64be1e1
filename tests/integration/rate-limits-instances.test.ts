/**
 * Limits shared by every app instance: two separate processes (tests/integration/helpers/
 * limit-instance.ts, each with its own connection pool and memory) serve the app's sign-in
 * check and a real API route against one database. Failed sign-ins and API calls spread over
 * both count together: the limit is reached after the same number of attempts as with one
 * instance, though each instance saw only half of them.
 */
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { getPool } from "@/db/client";
import { resetRateLimits, SIGN_IN_LIMIT } from "@/lib/auth/rate-limit";
import { SIGN_IN_ERROR } from "@/lib/auth/sign-in-errors";
import { processTestTimeout, startProcess, type Started } from "../helpers/processes";
import { addApiToken, createWorld, WORLD_PASSWORD, type World } from "./helpers/world";

const ROOT = path.resolve(import.meta.dirname, "../..");
const API_LIMIT = 8;

let w: World;
const instances: { proc: Started; origin: string }[] = [];

beforeAll(async () => {
  w = await createWorld();
  for (let i = 0; i < 2; i++) {
    const proc = startProcess(
      path.join(ROOT, "node_modules/.bin/tsx"),
      ["--conditions=react-server", "tests/integration/helpers/limit-instance.ts"],
      {
        cwd: ROOT,
        env: { ...process.env, API_RATE_LIMIT_PER_MINUTE: String(API_LIMIT) },
      },
    );
    const line = await proc.waitForLine(/^listening \d+/);
    instances.push({ proc, origin: `http://127.0.0.1:${line.split(" ")[1]}` });
  }
}, processTestTimeout(2));

afterAll(async () => {
  await Promise.all(instances.map((i) => i.proc.stop()));
  await getPool().end();
});

async function signInAt(
  n: number,
  email: string,
  password: string,
  ip: string,
): Promise<{ outcome: string; pid: number }> {
  const res = await fetch(`${instances[n % 2]!.origin}/sign-in`, {
    method: "POST",
    body: JSON.stringify({ email, password, ip }),
  });
  expect(res.status).toBe(200);
  return (await res.json()) as { outcome: string; pid: number };
}

describe("two instances, one database", () => {
  test("they are two processes", async () => {
    await resetRateLimits();
    const a = await signInAt(0, w.users.lead.email, WORLD_PASSWORD, "192.0.2.1");
    const b = await signInAt(1, w.users.lead.email, WORLD_PASSWORD, "192.0.2.1");
    expect([a.outcome, b.outcome]).toEqual(["signed-in", "signed-in"]);
    expect(a.pid).not.toBe(b.pid);
    expect(a.pid).not.toBe(process.pid);
  });

  test(`${SIGN_IN_LIMIT.maxFailures} failed sign-ins spread over both lock the e-mail at that address on both`, async () => {
    await resetRateLimits();
    const u = w.users.analystB;
    for (let i = 0; i < SIGN_IN_LIMIT.maxFailures; i++)
      expect((await signInAt(i, u.email, `wrong-${i}-password`, "203.0.113.5")).outcome).toBe("wrong");
    // each instance saw only half of the failures; the right password is refused on both
    expect((await signInAt(0, u.email, WORLD_PASSWORD, "203.0.113.5")).outcome).toBe(
      SIGN_IN_ERROR.tooManyAttempts,
    );
    expect((await signInAt(1, u.email, WORLD_PASSWORD, "203.0.113.5")).outcome).toBe(
      SIGN_IN_ERROR.tooManyAttempts,
    );
    // another address is not held back
    expect((await signInAt(1, u.email, WORLD_PASSWORD, "198.51.100.5")).outcome).toBe("signed-in");
  });

  test(`${API_LIMIT} API calls with one token spread over both use up its minute; the next gets 429 with Retry-After`, async () => {
    await resetRateLimits();
    const { token } = await addApiToken(w.users.providerA);
    const me = (n: number) =>
      fetch(`${instances[n % 2]!.origin}/api/v1/me`, { headers: { authorization: `Bearer ${token}` } });
    for (let i = 0; i < API_LIMIT; i++) expect((await me(i)).status).toBe(200);
    for (const n of [0, 1]) {
      const refused = await me(n);
      expect(refused.status).toBe(429);
      expect(Number(refused.headers.get("retry-after"))).toBeGreaterThanOrEqual(1);
      expect(((await refused.json()) as { code: string }).code).toBe("rate_limited");
    }
  });
});
