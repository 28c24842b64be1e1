"use server";

import { revalidatePath } from "next/cache";
import { getCurrentUser } from "@/lib/auth/session";
import { fail, type Result } from "@/lib/result";
import { createApiToken, revokeApiToken, type ApiTokenListItem } from "@/lib/people/commands-tokens";

/** Creates a personal API token; the token is returned once, here. */
export async function createTokenAction(name: string): Promise<Result<ApiTokenListItem & { token: string }>> {
  const actor = await getCurrentUser();
  if (!actor) return fail("Your session has ended. Sign in again.", undefined, "unauthenticated");
  const r = await createApiToken(actor.id, { name });
  revalidatePath("/settings");
  return r;
}

export async function revokeTokenAction(id: number): Promise<Result<{ id: number; revokedAt: Date }>> {
  const actor = await getCurrentUser();
  if (!actor) return fail("Your session has ended. Sign in again.", undefined, "unauthenticated");
  const r = await revokeApiToken(actor.id, id);
  revalidatePath("/settings");
  return r;
}
