import "server-only";
import { cache } from "react";
import { getServerSession } from "next-auth";
import { redirect } from "next/navigation";
import { authOptions } from "./options";
import { loadSessionUser, type SessionUser } from "./load-user";

export type { SessionUser } from "./load-user";

/**
 * The signed-in user for this request, or null. Reads the next-auth session, then re-reads
 * the user row: a deactivated account or a changed session_version (password change,
 * deactivation) gives null, so those sessions end at their next request. Cached per request.
 */
export const getCurrentUser = cache(async (): Promise<SessionUser | null> => {
  const session = await getServerSession(authOptions);
  const uid = session?.user?.id;
  if (!session || !uid || !session.sv) return null;
  return loadSessionUser(uid, session.sv);
});

/** For server components and actions: the signed-in user, or a redirect to /sign-in. */
export async function requireUser(): Promise<SessionUser> {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in");
  return user;
}
