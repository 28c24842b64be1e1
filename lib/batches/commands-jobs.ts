/** The admins' write on the check queue: send a failed check round again. */
import { eq } from "drizzle-orm";
import { z } from "zod";
import { checkJobs } from "@/db/schema";
import { write } from "@/lib/core/write";
import { fail, ok, type Result } from "@/lib/result";

/** An admin sends a failed job round again: three fresh attempts, from now. */
export function retryFailedJob(actorId: number, jobId: number): Promise<Result<null>> {
  return write({
    name: "retryFailedJob",
    actorId,
    // the jobs page is the admins' (user.manage)
    may: "user.manage",
    forbidden: "Only admins can retry checks.",
    schema: z.number().int().positive(),
    input: jobId,
    invalid: () => fail("There is no such check.", undefined, "not_found"),
    run: async ({ tx, input: id, audit }) => {
      const [job] = await tx
        .select({ id: checkJobs.id, status: checkJobs.status })
        .from(checkJobs)
        .where(eq(checkJobs.id, id))
        .for("update");
      if (!job || job.status !== "failed") {
        return fail("This check is not failed any more; reload the page.", undefined, "conflict");
      }
      await tx
        .update(checkJobs)
        .set({ status: "queued", attempts: 0, runAfter: new Date(), finishedAt: null, lockedBy: null })
        .where(eq(checkJobs.id, id));
      const change = { before: { status: "failed" }, after: { status: "queued" } };
      await audit({ action: "job.retry", objectType: "check_job", objectId: id, ...change });
      return ok(null);
    },
  });
}
