/**
 * The board and digest routes: leads and admins in, analysts and providers refused (403),
 * anonymous callers 401; the board's JSON carries the demo studies' pools and the send-now
 * answer says how many leads the digest was queued for.
 */
import { afterAll, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { users } from "@/db/schema";
import { call, expectSafeError } from "./helpers/api";
import { cookieOf } from "./helpers/seeded";

vi.mock("server-only", () => ({}));

const { GET: board } = await import("@/app/api/v1/board/route");
const { POST: digest } = await import("@/app/api/v1/board/digest/route");
const { GET: pools } = await import("@/app/api/v1/pool/route");

const db = getDb();

const as = async (email: string) => ({ cookie: await cookieOf(email) });

afterAll(async () => {
  await getPool().end();
});

describe("board routes", () => {
  it("gives a lead the board with every demo study's pool", async () => {
    const r = await call(board, { path: "/api/v1/board?weeks=4", as: await as("lead@lowmoor.test") });
    expect(r.status).toBe(200);
    const data = r.json.data as {
      pools: { studySlug: string; dfTarget: number }[];
      turnaround: { weeks: unknown[] };
    };
    // targets of the demo plans (lib/demo/plans.ts): barley 150 residual df
    expect(data.pools.find((p) => p.studySlug === "barley-nitrogen")?.dfTarget).toBe(150);
    expect(data.pools.some((p) => p.studySlug === "heat-pump-savings")).toBe(true);
    expect(data.turnaround.weeks).toHaveLength(4);
  });

  it("refuses analysts and providers (403), anonymous callers (401) and a bad period (422)", async () => {
    expectSafeError(
      (await call(board, { path: "/api/v1/board", as: await as("analyst@lowmoor.test") })).json,
      "forbidden",
    );
    expect(
      (await call(board, { path: "/api/v1/board", as: await as("provider@harrowgate.test") })).status,
    ).toBe(403);
    expect((await call(board, { path: "/api/v1/board" })).status).toBe(401);
    expect(
      (await call(board, { path: "/api/v1/board?weeks=0", as: await as("lead@lowmoor.test") })).status,
    ).toBe(422);
    expect(
      (
        await call(digest, {
          method: "POST",
          path: "/api/v1/board/digest",
          as: await as("provider@harrowgate.test"),
        })
      ).status,
    ).toBe(403);
  });

  it("queues the digest for every active lead on 'send now'", async () => {
    const leads = await db
      .select({ id: users.id })
      .from(users)
      .where(and(eq(users.role, "lead"), eq(users.active, true)));
    const r = await call(digest, {
      method: "POST",
      path: "/api/v1/board/digest",
      as: await as("admin@tributary.test"),
    });
    expect(r.status).toBe(202);
    expect(r.json.data).toMatchObject({ recipients: leads.length, queued: leads.length });
  });

  it("lists pools to an analyst for the assigned study only", async () => {
    const r = await call(pools, { path: "/api/v1/pool", as: await as("analyst2@lowmoor.test") });
    expect(r.status).toBe(200);
    expect((r.json.data as { slug: string }[]).map((p) => p.slug)).toEqual(["heat-pump-savings"]);
    expect(
      (await call(pools, { path: "/api/v1/pool", as: await as("provider@harrowgate.test") })).status,
    ).toBe(403);
  });
});
