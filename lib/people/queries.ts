import "server-only";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { apiTokens, organisations, ROLES, users } from "@/db/schema";
import { userIdentityColumns } from "@/lib/auth/load-user";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";
import { afterKey, keysetList, pageOf, rowsToRead, type Page, type PageRequest } from "@/lib/http/keyset";
import { PAGE_MAX } from "@/lib/http/page";

export type UserListItem = SessionUser & { active: boolean; createdAt: Date; updatedAt: Date };

export const userListColumns = {
  ...userIdentityColumns,
  createdAt: users.createdAt,
  updatedAt: users.updatedAt,
};

/**
 * Users page by role (in the order of ROLES: providers first), then name, then id (the tie-breaker).
 * The role is keyed by its place in ROLES, the order MariaDB sorts an ENUM in (its text compares
 * alphabetically, which is another order).
 */
export const USER_LIST = keysetList<[number, string, number]>("users", ["int", "text", "int"]);
const roleIndex = sql<number>`(${users.role} + 0)`;

/** A page of the users (never a password hash), for admins and leads; others get AppError("forbidden"). */
export async function listUsers(
  actor: SessionUser,
  page: PageRequest<[number, string, number]> = { limit: PAGE_MAX },
): Promise<Page<UserListItem, [number, string, number]>> {
  if (!can(actor.role, "user.manage") && !can(actor.role, "user.invite")) throw new AppError("forbidden");
  const rows = await getDb()
    .select(userListColumns)
    .from(users)
    .leftJoin(organisations, eq(organisations.id, users.organisationId))
    .where(afterKey([roleIndex, users.name, users.id], page.after, "asc"))
    .orderBy(asc(roleIndex), asc(users.name), asc(users.id))
    .limit(rowsToRead(page.limit));
  return pageOf(rows, page.limit, (u) => [ROLES.indexOf(u.role) + 1, u.name, u.id]);
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

/** Tokens page newest first by (created, id). */
export const TOKEN_LIST = keysetList<[Date, number]>("tokens", ["date", "int"]);

/** A page of the actor's own API tokens (never the token or its hash), newest first. */
export async function listApiTokens(
  actorId: number,
  page: PageRequest<[Date, number]> = { limit: PAGE_MAX },
): Promise<Page<ApiTokenListItem, [Date, number]>> {
  const rows = await getDb()
    .select({
      id: apiTokens.id,
      name: apiTokens.name,
      prefix: apiTokens.prefix,
      createdAt: apiTokens.createdAt,
      lastUsedAt: apiTokens.lastUsedAt,
      revokedAt: apiTokens.revokedAt,
    })
    .from(apiTokens)
    .where(
      and(eq(apiTokens.userId, actorId), afterKey([apiTokens.createdAt, apiTokens.id], page.after, "desc")),
    )
    .orderBy(desc(apiTokens.createdAt), desc(apiTokens.id))
    .limit(rowsToRead(page.limit));
  return pageOf(rows, page.limit, (t) => [t.createdAt, t.id]);
}
