"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/session";
import { fail, type Result } from "@/lib/result";
import { createStudy } from "@/lib/studies";

export type CreateStudyState = Result<null> | null;

/** Creates a study, then opens its plan editor to publish version 1. */
export async function createStudyAction(_prev: CreateStudyState, form: FormData): Promise<CreateStudyState> {
  const actor = await getCurrentUser();
  if (!actor) return fail("Your session has ended. Sign in again.", undefined, "unauthenticated");
  const r = await createStudy(actor.id, {
    slug: form.get("slug") ?? "",
    title: form.get("title") ?? "",
    description: form.get("description") ?? "",
    teamOrganisationId: form.get("teamOrganisationId") ?? "",
  });
  if (!r.ok) return { ok: false, message: r.message, fieldErrors: r.fieldErrors, code: r.code };
  revalidatePath("/studies");
  redirect(`/studies/${r.data.slug}/plan?created=1`);
}
