import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { organisations, users, type UserRole } from "@/db/schema";

/** The signed-in user as pages, services and route handlers see it (never the hash). */
export type SessionUser = {
  id: number;
  email: string;
  name: string;
  role: UserRole;
  organisationId: number | null;
  organisationName: string | null;
};

/** Who a user is, from users left-joined to organisations (never the password hash). */
export const userIdentityColumns = {
  id: users.id,
  email: users.email,
  name: users.name,
  role: users.role,
  organisationId: users.organisationId,
  organisationName: organisations.name,
  active: users.active,
};

/** The columns a SessionUser is read from. */
export const sessionUserColumns = { ...userIdentityColumns, sessionVersion: users.sessionVersion };

type SessionUserRow = {
  [K in keyof typeof sessionUserColumns]: (typeof sessionUserColumns)[K]["_"]["data"] | null;
};

/** The SessionUser of a row read with sessionUserColumns, or null when the account is not active. */
export function toSessionUser(row: SessionUserRow | undefined, sessionVersion?: number): SessionUser | null {
  if (!row || !row.active || row.id === null || row.role === null) return null;
  if (sessionVersion !== undefined && row.sessionVersion !== sessionVersion) return null;
  return {
    id: row.id,
    email: row.email ?? "",
    name: row.name ?? "",
    role: row.role,
    organisationId: row.organisationId,
    organisationName: row.organisationName,
  };
}

/**
 * Re-reads the user behind a session or token. Returns null when the account is gone,
 * deactivated, or (when `sessionVersion` is given) its session version moved on, which is
 * how deactivation and a password change end sessions that are already open.
 */
export async function loadSessionUser(userId: number, sessionVersion?: number): Promise<SessionUser | null> {
  if (!Number.isInteger(userId) || userId <= 0) return null;
  const rows = await getDb()
    .select(sessionUserColumns)
    .from(users)
    .leftJoin(organisations, eq(organisations.id, users.organisationId))
    .where(eq(users.id, userId))
    .limit(1);
  return toSessionUser(rows[0], sessionVersion);
}
