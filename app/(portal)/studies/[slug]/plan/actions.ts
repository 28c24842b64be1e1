"use server";

import { revalidatePath } from "next/cache";
import { getCurrentUser } from "@/lib/auth/session";
import { getStudyForUser } from "@/lib/studies/queries-detail";
import { fail, type Result } from "@/lib/result";
import { publishPlanVersion } from "@/lib/studies";

/** Publishes the edited plan as the study's next version; field errors carry the plan's dotted paths. */
export async function publishPlanAction(
  slug: string,
  plan: unknown,
  note: string,
): Promise<Result<{ version: number }>> {
  const actor = await getCurrentUser();
  if (!actor)
    return fail(
      "Your session has ended. Sign in again; your edits are still in this page.",
      undefined,
      "unauthenticated",
    );
  const study = await getStudyForUser(actor, slug);
  if (!study) return fail("This study is not visible to you (any more).", undefined, "not_found");
  const r = await publishPlanVersion(actor.id, study.id, plan, note);
  if (!r.ok) return r;
  revalidatePath(`/studies/${slug}`);
  revalidatePath("/studies");
  return { ok: true, data: { version: r.data.version } };
}
