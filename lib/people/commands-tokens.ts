import "server-only";
import { and, desc, eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { apiTokens } from "@/db/schema";
import { generateApiToken } from "@/lib/auth/api-tokens";
import { fail, fieldErrorsOf, ok, type Result } from "@/lib/result";
import { apiTokenIdSchema, createApiTokenSchema } from "@/lib/people/schemas-tokens";
import { loadActor } from "@/lib/core/actor";
import { recordAudit } from "@/lib/core/audit";
import { runService } from "@/lib/core/write";

export type ApiTokenListItem = { id: number; name: string; prefix: string; createdAt: Date; lastUsedAt: Date | null; revokedAt: Date | null };

const MAX_ACTIVE_TOKENS = 20;

/** The actor's own API tokens (never the token or its hash). */
export async function listApiTokens(actorId: number): Promise<ApiTokenListItem[]> {
  return getDb()
    .select({ id: apiTokens.id, name: apiTokens.name, prefix: apiTokens.prefix, createdAt: apiTokens.createdAt, lastUsedAt: apiTokens.lastUsedAt, revokedAt: apiTokens.revokedAt })
    .from(apiTokens)
    .where(eq(apiTokens.userId, actorId))
    .orderBy(desc(apiTokens.createdAt));
}

/** Creates an API token for the actor (token.manage). The token is returned here once and never again. */
export async function createApiToken(actorId: number, input: unknown): Promise<Result<ApiTokenListItem & { token: string }>> {
  return runService("createApiToken", async () => {
    const parsed = createApiTokenSchema.safeParse(input);
    if (!parsed.success) return fail("Check the highlighted fields.", fieldErrorsOf(parsed.error.issues));
    return getDb().transaction(async (tx) => {
      const actor = await loadActor(tx, actorId, "token.manage");
      const active = await tx.select({ id: apiTokens.id }).from(apiTokens).where(and(eq(apiTokens.userId, actor.id), isNull(apiTokens.revokedAt)));
      if (active.length >= MAX_ACTIVE_TOKENS) return fail(`You have ${MAX_ACTIVE_TOKENS} active tokens; revoke one you no longer use first.`, undefined, "conflict");
      const { token, hash, prefix } = generateApiToken();
      const createdAt = new Date();
      const [row] = await tx.insert(apiTokens).values({ userId: actor.id, name: parsed.data.name, tokenHash: hash, prefix, createdAt }).$returningId();
      if (!row) throw new Error("insert into api_tokens returned no id");
      await recordAudit(tx, { actorId: actor.id, action: "token.create", objectType: "api_token", objectId: row.id, after: { name: parsed.data.name, prefix } });
      return ok({ id: row.id, name: parsed.data.name, prefix, createdAt, lastUsedAt: null, revokedAt: null, token });
    });
  });
}

/** Revokes one of the actor's own tokens; someone else's token is "not found". */
export async function revokeApiToken(actorId: number, tokenId: unknown): Promise<Result<{ id: number; revokedAt: Date }>> {
  return runService("revokeApiToken", async () => {
    const id = apiTokenIdSchema.safeParse(tokenId);
    if (!id.success) return fail("There is no such token.", undefined, "not_found");
    return getDb().transaction(async (tx) => {
      const actor = await loadActor(tx, actorId, "token.manage");
      const rows = await tx
        .select({ id: apiTokens.id, revokedAt: apiTokens.revokedAt, name: apiTokens.name })
        .from(apiTokens)
        .where(and(eq(apiTokens.id, id.data), eq(apiTokens.userId, actor.id)))
        .for("update")
        .limit(1);
      const row = rows[0];
      if (!row) return fail<{ id: number; revokedAt: Date }>("There is no such token.", undefined, "not_found");
      if (row.revokedAt) return ok({ id: row.id, revokedAt: row.revokedAt });
      const revokedAt = new Date();
      await tx.update(apiTokens).set({ revokedAt }).where(eq(apiTokens.id, row.id));
      await recordAudit(tx, { actorId: actor.id, action: "token.revoke", objectType: "api_token", objectId: row.id, before: { revokedAt: null }, after: { revokedAt } });
      return ok({ id: row.id, revokedAt });
    });
  });
}
