/**
 * The one actor loader: the acting user as the database has it now (not as the session
 * remembers it), so a demotion or deactivation bites at the next change. No "server-only":
 * the worker and the scripts load actors too.
 */
import { eq } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { users, type UserRole } from "@/db/schema";
import { AppError } from "@/lib/errors";

export type Actor = { id: number; name: string; role: UserRole; organisationId: number | null };

/** The active user `actorId`; AppError("unauthenticated") when the account is gone or inactive. */
export async function loadActor(db: DbOrTx, actorId: number): Promise<Actor> {
  const rows = await db
    .select({
      id: users.id,
      name: users.name,
      role: users.role,
      organisationId: users.organisationId,
      active: users.active,
    })
    .from(users)
    .where(eq(users.id, actorId))
    .limit(1);
  const row = rows[0];
  if (!row || !row.active)
    throw new AppError("unauthenticated", "Your account is not active. Sign in again.");
  return { id: row.id, name: row.name, role: row.role, organisationId: row.organisationId };
}
