import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { and, eq, isNull, lt, or } from "drizzle-orm";
import { getDb } from "@/db/client";
import { apiTokens, organisations, users } from "@/db/schema";
import { sessionUserColumns, toSessionUser, type SessionUser } from "./load-user";

/** Tokens look like `trb_` + 32 url-safe characters; only their sha-256 is stored. */
export const API_TOKEN_PREFIX = "trb_";

export function generateApiToken(): { token: string; hash: string; prefix: string } {
  const token = API_TOKEN_PREFIX + randomBytes(24).toString("base64url");
  return { token, hash: hashApiToken(token), prefix: token.slice(0, 12) };
}

export function hashApiToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

export type TokenLookup =
  | { ok: true; user: SessionUser; tokenId: number }
  | { ok: false; reason: "unknown" | "revoked" | "inactive" };

// last_used_at is written at most once a minute per token, not on every call
const LAST_USED_RESOLUTION_MS = 60_000;

/**
 * Finds the user behind a Bearer API token: unknown or revoked tokens and inactive users
 * are refused; a good token has its last_used_at brought up to date.
 */
export async function lookupApiToken(token: string): Promise<TokenLookup> {
  if (!token.startsWith(API_TOKEN_PREFIX) || token.length > 100) return { ok: false, reason: "unknown" };
  const db = getDb();
  // one round trip: the token with its user (every API call with a token starts here)
  const rows = await db
    .select({
      tokenId: apiTokens.id,
      revokedAt: apiTokens.revokedAt,
      lastUsedAt: apiTokens.lastUsedAt,
      user: sessionUserColumns,
    })
    .from(apiTokens)
    .leftJoin(users, eq(users.id, apiTokens.userId))
    .leftJoin(organisations, eq(organisations.id, users.organisationId))
    .where(eq(apiTokens.tokenHash, hashApiToken(token)))
    .limit(1);
  const row = rows[0];
  if (!row) return { ok: false, reason: "unknown" };
  if (row.revokedAt) return { ok: false, reason: "revoked" };
  const user = toSessionUser(row.user);
  if (!user) return { ok: false, reason: "inactive" };
  const now = new Date();
  if (!row.lastUsedAt || row.lastUsedAt.getTime() < now.getTime() - LAST_USED_RESOLUTION_MS) {
    await db
      .update(apiTokens)
      .set({ lastUsedAt: now })
      .where(
        and(
          eq(apiTokens.id, row.tokenId),
          or(
            isNull(apiTokens.lastUsedAt),
            lt(apiTokens.lastUsedAt, new Date(now.getTime() - LAST_USED_RESOLUTION_MS)),
          ),
        ),
      );
  }
  return { ok: true, user, tokenId: row.tokenId };
}
