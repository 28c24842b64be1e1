/**
 * Real next-auth session cookies for tests: the JWT is built by authOptions' own jwt
 * callback and encrypted with next-auth's encode() and the test NEXTAUTH_SECRET, exactly
 * as a browser would hold it after signing in.
 */
import { encode, type JWT } from "next-auth/jwt";
import type { User } from "next-auth";
import { authOptions } from "@/lib/auth/options";
import type { WorldUser } from "./world";

export const SESSION_COOKIE = "next-auth.session-token";

function secret(): string {
  const s = process.env.NEXTAUTH_SECRET;
  if (!s) throw new Error("NEXTAUTH_SECRET is not set (tests/integration/global-setup.ts sets it)");
  return s;
}

/** The JWT next-auth stores at sign-in for this user (via the real jwt callback). */
export async function jwtAtSignIn(
  user: Pick<WorldUser, "id" | "email" | "name" | "role" | "sessionVersion">,
): Promise<JWT> {
  const signedIn: User = {
    id: String(user.id),
    email: user.email,
    name: user.name,
    role: user.role,
    sv: user.sessionVersion,
  };
  const jwt = authOptions.callbacks?.jwt;
  if (!jwt) throw new Error("authOptions has no jwt callback");
  // next-auth seeds the token with name, email and sub before calling the callback
  return jwt({
    token: { name: user.name, email: user.email, sub: String(user.id) },
    user: signedIn,
    account: null,
    trigger: "signIn",
  });
}

/** A `Cookie` header value carrying a signed-in session for `user`. */
export async function sessionCookieFor(
  user: Pick<WorldUser, "id" | "email" | "name" | "role" | "sessionVersion">,
): Promise<string> {
  const token = await encode({ token: await jwtAtSignIn(user), secret: secret() });
  return `${SESSION_COOKIE}=${token}`;
}

/** A cookie with a JWT encrypted under another secret: must be treated as no session. */
export async function forgedSessionCookie(user: WorldUser): Promise<string> {
  const token = await encode({
    token: await jwtAtSignIn(user),
    secret: "not-the-app-secret-0123456789abcdef",
  });
  return `${SESSION_COOKIE}=${token}`;
}
