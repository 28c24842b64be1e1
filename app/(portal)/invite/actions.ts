"use server";

import { requestAddress } from "@/lib/auth/request-address";
import { getCurrentUser } from "@/lib/auth/session";
import { fail, type Result } from "@/lib/result";
import { createUser, type UserRecord } from "@/lib/people/commands-users";

/** Invites a provider or analyst: the account is created without a password and an e-mail link lets them choose one. */
export async function inviteAction(input: {
  email: string;
  name: string;
  role: string;
  organisationId: string;
}): Promise<Result<UserRecord>> {
  const actor = await getCurrentUser();
  if (!actor) return fail("Your session has ended. Sign in again.", undefined, "unauthenticated");
  return createUser(actor.id, { ...input, password: "" }, { ip: await requestAddress() });
}
