"use server";

import { revalidatePath } from "next/cache";
import { getCurrentUser } from "@/lib/auth/session";
import { fail, type Result } from "@/lib/result";
import { decideVersion, type DecisionDone, type DecisionInput } from "@/lib/batches/commands-decide";

/** Accept or bounce a version; the service re-reads the role and the state and does it all in one transaction. */
export async function decideAction(
  batchId: string,
  version: number,
  input: DecisionInput,
): Promise<Result<DecisionDone>> {
  const actor = await getCurrentUser();
  if (!actor) return fail("Your session has ended. Sign in again.", undefined, "unauthenticated");
  const r = await decideVersion(actor.id, batchId, version, input);
  revalidatePath(`/batches/${batchId}`);
  return r;
}
