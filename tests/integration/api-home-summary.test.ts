/** getHomeSummary(): what each role's home shows, scoped like the API, counted against plain SQL. */
import type { RowDataPacket } from "mysql2";
import { beforeAll, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));

import { getPool } from "@/db/client";
import type { SessionUser } from "@/lib/auth/session";
import { getHomeSummary, HOME_QUEUE_SHOWN } from "@/lib/batches/queries-home";
import { listOrganisations } from "@/lib/people/queries-organisations";
import { listUsers } from "@/lib/people/queries";
import { createWorld, type World, type WorldUser } from "./helpers/world";

let w: World;

beforeAll(async () => {
  w = await createWorld();
});

function sessionUser(u: WorldUser, organisationName: string | null = null): SessionUser {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    organisationId: u.organisationId,
    organisationName,
  };
}

async function sqlCount(query: string): Promise<number> {
  const [rows] = await getPool().query<RowDataPacket[]>(query);
  return Number(rows[0]?.n);
}

describe("getHomeSummary", () => {
  test("provider: its organisation, its studies and its batches by state", async () => {
    const home = await getHomeSummary(sessionUser(w.users.providerA, w.farmA.name));
    if (home.role !== "provider") throw new Error(`expected a provider home, got ${home.role}`);
    expect(home.organisation).toEqual({ id: w.farmA.id, name: w.farmA.name });
    expect(home.studies.map((s) => [s.id, s.batchesByState.ready])).toEqual([[w.studyA.id, 1]]);
    expect(home.batchesByState).toMatchObject({ ready: 1, accepted: 0, bounced: 0 });
    expect(home.recentBatches.map((b) => b.publicId)).toEqual([w.batchA.publicId]);
  });

  test("analyst: assigned studies with what is ready for review, and the queue", async () => {
    const a = await getHomeSummary(sessionUser(w.users.analystA));
    const b = await getHomeSummary(sessionUser(w.users.analystB));
    if (a.role !== "analyst" || b.role !== "analyst") throw new Error("expected analyst homes");
    expect(a.studies.map((s) => [s.id, s.readyForReview])).toEqual([[w.studyA.id, 1]]);
    expect(a.readyForReview).toBe(1);
    expect(a.queue.map((q) => q.publicId)).toEqual([w.batchA.publicId]);
    // study B's only batch is accepted: nothing waits for analyst B
    expect(b.studies.map((s) => [s.id, s.readyForReview, s.batchesByState.accepted])).toEqual([
      [w.studyB.id, 0, 1],
    ]);
    expect(b.queue).toEqual([]);
  });

  test("analyst: past the home's list, the count still says how many wait (the page links to the queue)", async () => {
    const big = await createWorld();
    for (let i = 0; i < HOME_QUEUE_SHOWN + 4; i++) {
      await big.addBatch(big.studyA.id, big.farmA.id, big.users.providerA, "ready");
    }
    const home = await getHomeSummary(sessionUser(big.users.analystA));
    if (home.role !== "analyst") throw new Error("expected an analyst home");
    // the world's own ready batch plus the ones added here
    expect(home.readyForReview).toBe(HOME_QUEUE_SHOWN + 5);
    expect(home.queue).toHaveLength(HOME_QUEUE_SHOWN);
    expect(new Set(home.queue.map((q) => q.publicId)).size).toBe(HOME_QUEUE_SHOWN);
  });

  test("lead: every study with batches by state and providers admitted", async () => {
    const home = await getHomeSummary(sessionUser(w.users.lead));
    if (home.role !== "lead") throw new Error("expected a lead home");
    const a = home.studies.find((s) => s.id === w.studyA.id);
    const b = home.studies.find((s) => s.id === w.studyB.id);
    expect(a).toMatchObject({ providersAdmitted: 1, batchesByState: { ready: 1, accepted: 0 } });
    expect(b).toMatchObject({ providersAdmitted: 1, batchesByState: { ready: 0, accepted: 1 } });
    const total = await sqlCount(
      "SELECT COUNT(*) AS n FROM batches b JOIN batch_versions v ON v.batch_id = b.id AND v.version = b.latest_version",
    );
    expect(Object.values(home.batchesByState).reduce((x, y) => x + y, 0)).toBe(total);
  });

  test("admin: users by role, organisations and studies, as plain SQL counts them", async () => {
    const home = await getHomeSummary(sessionUser(w.users.admin));
    if (home.role !== "admin") throw new Error("expected an admin home");
    for (const role of ["provider", "analyst", "lead", "admin"] as const) {
      expect(home.usersByRole[role]).toBe(
        await sqlCount(`SELECT COUNT(*) AS n FROM users WHERE role = '${role}'`),
      );
    }
    expect(home.inactiveUsers).toBe(await sqlCount("SELECT COUNT(*) AS n FROM users WHERE active = 0"));
    expect(home.activeUsers + home.inactiveUsers).toBe(await sqlCount("SELECT COUNT(*) AS n FROM users"));
    expect(home.organisations.provider).toBe(
      await sqlCount("SELECT COUNT(*) AS n FROM organisations WHERE kind = 'provider'"),
    );
    expect(home.organisations.team).toBe(
      await sqlCount("SELECT COUNT(*) AS n FROM organisations WHERE kind = 'team'"),
    );
    expect(home.studies).toBe(await sqlCount("SELECT COUNT(*) AS n FROM studies"));
  });
});

describe("users and organisations", () => {
  test("listUsers is for admins and leads; others are refused", async () => {
    const list = (await listUsers(sessionUser(w.users.lead))).rows;
    expect(list.map((u) => u.id)).toEqual(expect.arrayContaining([w.users.providerA.id]));
    expect(JSON.stringify(list)).not.toMatch(/hash/i);
    await expect(listUsers(sessionUser(w.users.providerA))).rejects.toMatchObject({ code: "forbidden" });
    await expect(listUsers(sessionUser(w.users.analystA))).rejects.toMatchObject({ code: "forbidden" });
  });

  test("listOrganisations: all for admins, only its own for a provider", async () => {
    const all = await listOrganisations(sessionUser(w.users.admin));
    expect(all.length).toBe(await sqlCount("SELECT COUNT(*) AS n FROM organisations"));
    expect(all.find((o) => o.id === w.farmA.id)?.userCount).toBe(1);
    const own = await listOrganisations(sessionUser(w.users.providerA));
    expect(own.map((o) => o.id)).toEqual([w.farmA.id]);
  });
});
