/**
 * Permissions as data: which actions each role may take. The UI reads this table to hide
 * what a user cannot do; every route handler and service enforces it with the role read
 * from the database. Safe to import from client components.
 */
import type { UserRole } from "@/db/schema";

export const ACTIONS = [
  "study.read",
  "study.manage",
  "plan.edit",
  "batch.upload",
  "batch.read",
  "batch.decide",
  "pool.read",
  "board.read",
  "user.manage",
  "user.invite",
  "token.manage",
  "audit.read",
  "mailbox.read",
] as const;

export type Action = (typeof ACTIONS)[number];

export const PERMISSIONS: Record<UserRole, readonly Action[]> = {
  // providers work on their own organisation's batches only (scoping is in lib/studies/scope.ts)
  provider: ["study.read", "batch.upload", "batch.read", "token.manage", "mailbox.read"],
  // analysts work on the studies they are assigned to
  analyst: ["study.read", "batch.read", "batch.decide", "pool.read", "token.manage", "mailbox.read"],
  // leads track every study and invite providers and analysts
  lead: [
    "study.read",
    "study.manage",
    "plan.edit",
    "batch.read",
    "pool.read",
    "board.read",
    "user.invite",
    "audit.read",
    "token.manage",
    "mailbox.read",
  ],
  admin: ACTIONS,
};

/** Whether `role` may take `action`. */
export function can(role: UserRole | null | undefined, action: Action): boolean {
  if (!role) return false;
  return PERMISSIONS[role]?.includes(action) ?? false;
}

/** Roles a user with `user.invite` (and not `user.manage`) may create. */
export const INVITABLE_ROLES: readonly UserRole[] = ["provider", "analyst"];
