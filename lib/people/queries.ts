import "server-only";
import { asc, desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { apiTokens, organisations, users } from "@/db/schema";
import { userIdentityColumns } from "@/lib/auth/load-user";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";

export type UserListItem = SessionUser & { active: boolean; createdAt: Date; updatedAt: Date };

export const userListColumns = {
  ...userIdentityColumns,
  createdAt: users.createdAt,
  updatedAt: users.updatedAt,
};

/** Every user (never a password hash), for admins and leads; others get AppError("forbidden"). */
export async function listUsers(actor: SessionUser): Promise<UserListItem[]> {
  if (!can(actor.role, "user.manage") && !can(actor.role, "user.invite")) throw new AppError("forbidden");
  return getDb()
    .select(userListColumns)
    .from(users)
    .leftJoin(organisations, eq(organisations.id, users.organisationId))
    .orderBy(asc(users.role), asc(users.name));
}

/** One user by id for admins and leads, or null. */
export async function getUserForAdmin(actor: SessionUser, userId: number): Promise<UserListItem | null> {
  if (!can(actor.role, "user.manage") && !can(actor.role, "user.invite")) throw new AppError("forbidden");
  const rows = await getDb()
    .select(userListColumns)
    .from(users)
    .leftJoin(organisations, eq(organisations.id, users.organisationId))
    .where(eq(users.id, userId))
    .limit(1);
  return rows[0] ?? null;
}

export type ApiTokenListItem = {
  id: number;
  name: string;
  prefix: string;
  createdAt: Date;
  lastUsedAt: Date | null;
  revokedAt: Date | null;
};

/** The actor's own API tokens (never the token or its hash). */
export async function listApiTokens(actorId: number): Promise<ApiTokenListItem[]> {
  return getDb()
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      prefix: apiTokens.prefix,
      createdAt: apiTokens.createdAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .where(eq(apiTokens.userId, actorId))
    .orderBy(desc(apiTokens.createdAt));
}
