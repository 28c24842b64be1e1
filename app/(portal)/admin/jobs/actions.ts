"use server";

import { revalidatePath } from "next/cache";
import { getDb } from "@/db/client";
import { can } from "@/lib/auth/permissions";
import { getCurrentUser } from "@/lib/auth/session";
import { retryFailedJob } from "@/lib/batches/jobs/check-jobs";
import { fail, ok, type Result } from "@/lib/result";

export async function retryJobAction(jobId: number): Promise<Result<null>> {
  const user = await getCurrentUser();
  if (!user) return fail("Your session has ended. Sign in again.", undefined, "unauthenticated");
  if (!can(user.role, "user.manage")) return fail("Only admins can retry checks.", undefined, "forbidden");
  const done = await retryFailedJob(getDb(), user.id, jobId);
  revalidatePath("/admin/jobs");
  return done ? ok(null) : fail("This check is not failed any more; reload the page.", undefined, "conflict");
}
