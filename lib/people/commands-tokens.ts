import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import { apiTokens } from "@/db/schema";
import { generateApiToken } from "@/lib/auth/api-tokens";
import { write } from "@/lib/core/write";
import { fail, ok, type Result } from "@/lib/result";
import { apiTokenIdSchema, createApiTokenSchema } from "./schemas";

import type { ApiTokenListItem } from "./queries";

export type { ApiTokenListItem };

const MAX_ACTIVE_TOKENS = 20;
const NO_SUCH_TOKEN = "There is no such token.";

/** Creates an API token for the actor (token.manage). The token is returned here once and never again. */
export function createApiToken(
  actorId: number,
  input: unknown,
): Promise<Result<ApiTokenListItem & { token: string }>> {
  return write({
    name: "createApiToken",
    actorId,
    may: "token.manage",
    schema: createApiTokenSchema,
    input,
    run: async ({ tx, actor, input: { name }, audit }) => {
      const active = await tx
        .select({ id: apiTokens.id })
        .from(apiTokens)
        .where(and(eq(apiTokens.userId, actor.id), isNull(apiTokens.revokedAt)));
      if (active.length >= MAX_ACTIVE_TOKENS) {
        return fail(
          `You have ${MAX_ACTIVE_TOKENS} active tokens; revoke one you no longer use first.`,
          undefined,
          "conflict",
        );
      }
      const { token, hash, prefix } = generateApiToken();
      const createdAt = new Date();
      const [row] = await tx
        .insert(apiTokens)
        .values({ userId: actor.id, name, tokenHash: hash, prefix, createdAt })
        .$returningId();
      if (!row) throw new Error("insert into api_tokens returned no id");
      await audit({
        action: "token.create",
        objectType: "api_token",
        objectId: row.id,
        after: { name, prefix },
      });
      return ok({ id: row.id, name, prefix, createdAt, lastUsedAt: null, revokedAt: null, token });
    },
  });
}

/** Revokes one of the actor's own tokens; someone else's token is "not found". */
export function revokeApiToken(
  actorId: number,
  tokenId: unknown,
): Promise<Result<{ id: number; revokedAt: Date }>> {
  return write({
    name: "revokeApiToken",
    actorId,
    may: "token.manage",
    schema: apiTokenIdSchema,
    input: tokenId,
    invalid: () => fail(NO_SUCH_TOKEN, undefined, "not_found"),
    run: async ({ tx, actor, input: id, audit }) => {
      const rows = await tx
        .select({ id: apiTokens.id, revokedAt: apiTokens.revokedAt })
        .from(apiTokens)
        .where(and(eq(apiTokens.id, id), eq(apiTokens.userId, actor.id)))
        .for("update")
        .limit(1);
      const row = rows[0];
      if (!row) return fail(NO_SUCH_TOKEN, undefined, "not_found");
      if (row.revokedAt) return ok({ id: row.id, revokedAt: row.revokedAt });
      const revokedAt = new Date();
      await tx.update(apiTokens).set({ revokedAt }).where(eq(apiTokens.id, row.id));
      await audit({
        action: "token.revoke",
        objectType: "api_token",
        objectId: row.id,
        before: { revokedAt: null },
        after: { revokedAt },
      });
      return ok({ id: row.id, revokedAt });
    },
  });
}
