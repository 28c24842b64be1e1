import "server-only";
import { eq } from "drizzle-orm";
import { users, type UserRole } from "@/db/schema";
import { can, type Action } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import type { DbOrTx } from "./audit";

export type Actor = { id: number; role: UserRole; organisationId: number | null };

/**
 * The acting user as the database has it now (not as the session remembers it), so a
 * demotion or deactivation bites at the next mutation. Throws AppError when the actor is
 * gone or inactive ("unauthenticated") or lacks `action` ("forbidden").
 */
export async function loadActor(db: DbOrTx, actorId: number, action?: Action): Promise<Actor> {
  const rows = await db
    .select({ id: users.id, role: users.role, organisationId: users.organisationId, active: users.active })
    .from(users)
    .where(eq(users.id, actorId))
    .limit(1);
  const row = rows[0];
  if (!row || !row.active) throw new AppError("unauthenticated", "Your account is not active. Sign in again.");
  if (action && !can(row.role, action)) throw new AppError("forbidden");
  return { id: row.id, role: row.role, organisationId: row.organisationId };
}
