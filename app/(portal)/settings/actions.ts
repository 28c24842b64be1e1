"use server";

import { getCurrentUser } from "@/lib/auth/session";
import { changeOwnPassword } from "@/lib/people/commands-users";
import { changePasswordSchema } from "@/lib/people/schemas";
import { fail, fieldErrorsOf, type Result } from "@/lib/result";

export type ChangePasswordState = Result<null> | null;

/** Changes the signed-in user's password; the service checks the current one and ends older sessions. */
export async function changePasswordAction(
  _prev: ChangePasswordState,
  form: FormData,
): Promise<ChangePasswordState> {
  const actor = await getCurrentUser();
  if (!actor) return fail("Your session has ended. Sign in again.", undefined, "unauthenticated");
  const parsed = changePasswordSchema.safeParse(Object.fromEntries(form));
  if (!parsed.success) return fail("Check the marked fields.", fieldErrorsOf(parsed.error.issues));
  const res = await changeOwnPassword(
    actor.id,
    parsed.data.currentPassword,
    parsed.data.newPassword,
    parsed.data.confirmPassword,
  );
  if (!res.ok) return { ok: false, message: res.message, fieldErrors: res.fieldErrors, code: res.code };
  return { ok: true, data: null };
}
