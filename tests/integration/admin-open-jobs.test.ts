/**
 * listOpenCheckJobs(): the admins' list of checks waiting, running or failed, newest first, with
 * whether more are open than it lists (the page then says so instead of stopping silently).
 */
import { afterAll, beforeAll, describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));

import { inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { checkJobs } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";
import { listOpenCheckJobs } from "@/lib/batches/queries-jobs";
import { createWorld, type World, type WorldUser } from "./helpers/world";

let w: World;
const mine: number[] = [];

const asUser = (u: WorldUser): SessionUser => ({
  id: u.id,
  email: u.email,
  name: u.name,
  role: u.role,
  organisationId: u.organisationId,
  organisationName: null,
});

beforeAll(async () => {
  w = await createWorld();
  const db = getDb();
  // two failed checks of this world, the newest open jobs in the database once inserted
  for (let i = 0; i < 2; i++) {
    const b = await w.addBatch(w.studyA.id, w.farmA.id, w.users.providerA, "ready");
    const [j] = await db
      .insert(checkJobs)
      .values({
        batchVersionId: b.versionId,
        status: "failed",
        attempts: 3,
        lastError: `test ${i}`,
        finishedAt: new Date(),
      })
      .$returningId();
    mine.push(j!.id);
  }
});

afterAll(async () => {
  // failed jobs left behind would show on other tests' admin pages
  await getDb().delete(checkJobs).where(inArray(checkJobs.id, mine));
});

describe("listOpenCheckJobs", () => {
  test("lists at most the limit, newest first, and says when more are open", async () => {
    const admin = asUser(w.users.admin);
    const one = await listOpenCheckJobs(admin, 1);
    expect(one.jobs.map((j) => j.id)).toEqual([mine[1]]);
    expect(one.more).toBe(true);

    const all = await listOpenCheckJobs(admin, 100_000);
    expect(all.more).toBe(false);
    expect(all.jobs.map((j) => j.id).slice(0, 2)).toEqual([mine[1], mine[0]]);
    expect(all.jobs.find((j) => j.id === mine[0])).toMatchObject({ status: "failed", lastError: "test 0" });
  });

  test("only admins may read it", async () => {
    await expect(listOpenCheckJobs(asUser(w.users.lead))).rejects.toBeInstanceOf(AppError);
  });
});
