import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { users, type UserRole } from "@/db/schema";
import { verifyPassword } from "./password";
import { checkSignInAllowed, clearSignInFailures, recordSignInFailure } from "./rate-limit";
import { SIGN_IN_ERROR } from "./sign-in-errors";

export type AuthorizedUser = { id: string; email: string; name: string; role: UserRole; sv: number };

/** Thrown to next-auth: its message (a code of SIGN_IN_ERROR) reaches the sign-in page as `?error=`. */
export class SignInRefused extends Error {}

/**
 * Checks an e-mail and password for the credentials provider. Wrong e-mail or password →
 * null (next-auth reports "CredentialsSignin"); a deactivated account or too many failures
 * → SignInRefused carrying a SIGN_IN_ERROR code.
 */
export async function authorizeCredentials(
  credentials: { email?: unknown; password?: unknown } | undefined,
  meta: { ip: string },
): Promise<AuthorizedUser | null> {
  const email = typeof credentials?.email === "string" ? credentials.email.trim().toLowerCase() : "";
  const password = typeof credentials?.password === "string" ? credentials.password : "";
  if (!email || !password || email.length > 320 || password.length > 200) return null;

  const gate = await checkSignInAllowed(email, meta.ip);
  if (!gate.allowed) {
    // the password is not even compared: a guesser learns nothing more until the window moves
    throw new SignInRefused(SIGN_IN_ERROR.tooManyAttempts);
  }

  const rows = await getDb()
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      passwordHash: users.passwordHash,
      active: users.active,
      sessionVersion: users.sessionVersion,
    })
    .from(users)
    .where(eq(users.email, email))
    .limit(1);
  const row = rows[0];

  const matches = await verifyPassword(password, row?.passwordHash);
  if (!row || !matches) {
    await recordSignInFailure(email, meta.ip);
    return null;
  }
  // only told to someone who knows the password, so it does not reveal which accounts exist
  if (!row.active) {
    throw new SignInRefused(SIGN_IN_ERROR.deactivated);
  }
  await clearSignInFailures(email, meta.ip);
  return { id: String(row.id), email: row.email, name: row.name, role: row.role, sv: row.sessionVersion };
}

/** The client address for throttling, from the headers next-auth hands to authorize(). */
export function clientIpOf(headers: Record<string, unknown> | Headers | undefined): string {
  const get = (name: string): string | undefined => {
    if (!headers) return undefined;
    if (headers instanceof Headers) return headers.get(name) ?? undefined;
    const v = headers[name];
    return typeof v === "string" ? v : Array.isArray(v) && typeof v[0] === "string" ? v[0] : undefined;
  };
  const forwarded = get("x-forwarded-for")?.split(",")[0]?.trim();
  return forwarded || get("x-real-ip")?.trim() || "local";
}
