"use server";

import { revalidatePath } from "next/cache";
import { getCurrentUser } from "@/lib/auth/session";
import { retryFailedJob } from "@/lib/batches";
import { fail, type Result } from "@/lib/result";

export async function retryJobAction(jobId: number): Promise<Result<null>> {
  const user = await getCurrentUser();
  if (!user) return fail("Your session has ended. Sign in again.", undefined, "unauthenticated");
  const done = await retryFailedJob(user.id, jobId);
  revalidatePath("/admin/jobs");
  return done;
}
