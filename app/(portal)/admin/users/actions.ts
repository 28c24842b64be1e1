"use server";

import { revalidatePath } from "next/cache";
import { can } from "@/lib/auth/permissions";
import { requestAddress } from "@/lib/auth/request-address";
import { getCurrentUser } from "@/lib/auth/session";
import { changeRole, createUser, setActive } from "@/lib/people/commands-users";
import { createUserSchema, roleSchema, userIdSchema } from "@/lib/people/schemas";
import { fail, fieldErrorsOf, type Result } from "@/lib/result";

// Thin actions: check the input's shape for field errors, then let the service decide
// (it re-reads the actor's role from the database and writes the audit row).

const SIGNED_OUT = "Your session has ended. Sign in again.";

export type CreateUserState = Result<{ id: number; email: string }> | null;

export async function createUserAction(_prev: CreateUserState, form: FormData): Promise<CreateUserState> {
  const actor = await getCurrentUser();
  if (!actor) return fail(SIGNED_OUT, undefined, "unauthenticated");
  // this form sets a password, so it is for admins only; leads invite through /invite, where the person chooses it
  if (!can(actor.role, "user.manage"))
    return fail(
      "Only admins create accounts with a password; invite people instead.",
      undefined,
      "forbidden",
    );
  const parsed = createUserSchema.safeParse(Object.fromEntries(form));
  if (!parsed.success) return fail("Check the marked fields.", fieldErrorsOf(parsed.error.issues));
  const res = await createUser(actor.id, parsed.data, { ip: await requestAddress() });
  if (!res.ok) return res;
  revalidatePath("/admin/users");
  revalidatePath("/admin");
  return { ok: true, data: { id: res.data.id, email: res.data.email } };
}

export async function changeRoleAction(userId: number, role: string): Promise<Result<null>> {
  const actor = await getCurrentUser();
  if (!actor) return fail(SIGNED_OUT, undefined, "unauthenticated");
  const id = userIdSchema.safeParse(userId);
  const r = roleSchema.safeParse(role);
  if (!id.success || !r.success) return fail("Choose one of the listed roles.");
  const res = await changeRole(actor.id, id.data, r.data);
  if (!res.ok) return res;
  revalidatePath("/admin/users");
  revalidatePath("/admin");
  return { ok: true, data: null };
}

export async function setActiveAction(userId: number, active: boolean): Promise<Result<null>> {
  const actor = await getCurrentUser();
  if (!actor) return fail(SIGNED_OUT, undefined, "unauthenticated");
  const id = userIdSchema.safeParse(userId);
  if (!id.success || typeof active !== "boolean")
    return fail("That user could not be found; reload the page.");
  const res = await setActive(actor.id, id.data, active);
  if (!res.ok) return res;
  revalidatePath("/admin/users");
  revalidatePath("/admin");
  return { ok: true, data: null };
}
