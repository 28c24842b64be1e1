/** The permissions table: what the roles of README.md "Using Tributary, role by role" ask of each, and nothing more. */
import { describe, expect, test } from "vitest";
import { ROLES } from "@/db/schema";
import { ACTIONS, can, PERMISSIONS, type Action } from "@/lib/auth/permissions";

// README.md "Using Tributary, role by role": provider uploads and reads its batches; analyst reviews (decides)
// and reads the pool; lead tracks the board and invites; admin runs the installation.
const MUST: Record<(typeof ROLES)[number], Action[]> = {
  provider: ["study.read", "batch.upload", "batch.read"],
  analyst: ["study.read", "batch.read", "batch.decide", "pool.read"],
  lead: ["study.read", "batch.read", "pool.read", "board.read", "user.invite", "audit.read"],
  admin: [...ACTIONS],
};
const MUST_NOT: Record<(typeof ROLES)[number], Action[]> = {
  provider: [
    "batch.decide",
    "pool.read",
    "board.read",
    "user.manage",
    "user.invite",
    "study.manage",
    "plan.edit",
    "audit.read",
  ],
  analyst: ["batch.upload", "board.read", "user.manage", "user.invite", "study.manage", "plan.edit"],
  lead: ["user.manage", "batch.upload", "batch.decide"],
  admin: [],
};

describe("permissions", () => {
  test.each(ROLES)("%s has what its job needs and no more", (role) => {
    for (const a of MUST[role]) expect(can(role, a), `${role} should ${a}`).toBe(true);
    for (const a of MUST_NOT[role]) expect(can(role, a), `${role} must not ${a}`).toBe(false);
  });

  test("the table names only known actions, each once", () => {
    for (const role of ROLES) {
      const list = PERMISSIONS[role];
      expect(new Set(list).size).toBe(list.length);
      for (const a of list) expect(ACTIONS).toContain(a);
    }
  });

  test("no role, or an unknown role, may do anything", () => {
    expect(can(null, "study.read")).toBe(false);
    expect(can(undefined, "study.read")).toBe(false);
    expect(can("owner" as never, "study.read")).toBe(false);
  });
});
