/**
 * The demo sign-ins of README.md "Using Tributary, role by role" against the seeded test database:
 * each signs in with the demo password as its role and sees the studies the table says.
 * Read-only: the demo accounts are shared with other test files.
 */
import { beforeAll, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));

import { GET as listStudies } from "@/app/api/v1/studies/route";
import { GET as getStudy } from "@/app/api/v1/studies/[id]/route";
import { authorizeCredentials } from "@/lib/auth/credentials";
import { resetRateLimits } from "@/lib/auth/rate-limit";
import { DEMO_PASSWORD } from "@/lib/demo";
import { call } from "./helpers/api";
import { sessionCookieFor } from "./helpers/session";

const ip = { ip: "198.51.100.77" };
beforeAll(() => resetRateLimits());

// README.md "Using Tributary, role by role": e-mail → role and the demo studies (by slug) each account works on
const ACCOUNTS = [
  ["admin@tributary.test", "admin", ["barley-nitrogen", "heat-pump-savings"]],
  ["lead@lowmoor.test", "lead", ["barley-nitrogen", "heat-pump-savings"]],
  ["analyst@lowmoor.test", "analyst", ["barley-nitrogen"]],
  ["analyst2@lowmoor.test", "analyst", ["heat-pump-savings"]],
  ["provider@harrowgate.test", "provider", ["barley-nitrogen"]],
  ["provider@fennick.test", "provider", ["barley-nitrogen"]],
  ["installer@greenhearth.test", "provider", ["heat-pump-savings"]],
] as const;
const DEMO_SLUGS = ["barley-nitrogen", "heat-pump-savings"];

describe("demo accounts", () => {
  test.each(ACCOUNTS)("%s signs in as %s and sees %j", async (email, role, slugs) => {
    const user = await authorizeCredentials({ email, password: DEMO_PASSWORD }, ip);
    expect(user).toMatchObject({ email, role });
    const cookie = await sessionCookieFor({
      id: Number(user!.id),
      email,
      name: user!.name,
      role,
      sessionVersion: user!.sv,
    });
    const res = await call(listStudies, { path: "/api/v1/studies", as: { cookie } });
    expect(res.status).toBe(200);
    const seen = (res.json.data as { slug: string }[])
      .map((s) => s.slug)
      .filter((s) => DEMO_SLUGS.includes(s));
    expect(seen.sort()).toEqual([...slugs].sort());
    for (const other of DEMO_SLUGS.filter((s) => !(slugs as readonly string[]).includes(s))) {
      const refused = await call(getStudy, {
        path: `/api/v1/studies/${other}`,
        params: { id: other },
        as: { cookie },
      });
      expect(refused.status).toBe(404);
    }
  });

  test("inactive@harrowgate.test cannot sign in", async () => {
    await expect(
      authorizeCredentials({ email: "inactive@harrowgate.test", password: DEMO_PASSWORD }, ip),
    ).rejects.toThrow("AccountDeactivated");
  });

  test("a demo account with a wrong password is refused", async () => {
    expect(
      await authorizeCredentials({ email: "admin@tributary.test", password: "tributary-demo!" }, ip),
    ).toBeNull();
  });
});
