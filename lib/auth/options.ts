import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { rawSetting } from "@/lib/env";
import { authorizeCredentials, clientIpOf } from "./credentials";

/** Sessions last a working day; deactivation and password changes end them sooner. */
export const SESSION_MAX_AGE_SECONDS = 12 * 60 * 60;

/**
 * Session cookies marked Secure and named with the `__Secure-`/`__Host-` prefixes when the
 * app is served over https. Decided from NEXTAUTH_URL — the address next-auth's getToken()
 * also reads to pick the cookie name back — and lib/env.ts makes sure it is https whenever
 * APP_URL is. The cookies are httpOnly and SameSite=Lax (next-auth's defaults, kept).
 */
export function secureCookiesFor(
  source: Record<string, string | undefined> = { NEXTAUTH_URL: rawSetting("NEXTAUTH_URL") },
): boolean {
  return (source.NEXTAUTH_URL ?? "").startsWith("https://");
}

/**
 * next-auth v4: e-mail + password, JWT sessions. The JWT carries uid, role and sv (the
 * user's session_version); getCurrentUser() re-reads the user on every request, so the
 * role here is for display and a bumped session_version ends the session.
 */
export const authOptions: NextAuthOptions = {
  secret: rawSetting("NEXTAUTH_SECRET"),
  useSecureCookies: secureCookiesFor(),
  session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_SECONDS },
  jwt: { maxAge: SESSION_MAX_AGE_SECONDS },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    CredentialsProvider({
      id: "credentials",
      name: "E-mail and password",
      credentials: {
        email: { label: "E-mail", type: "email" },
        password: { label: "Password", type: "password" },
      },
      authorize: (credentials, req) => authorizeCredentials(credentials, { ip: clientIpOf(req?.headers) }),
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      // `user` is present only at sign-in; later calls keep what was stored then
      if (user) {
        token.uid = Number(user.id);
        token.role = user.role;
        token.sv = user.sv;
        token.email = user.email;
        token.name = user.name;
      }
      return token;
    },
    session({ session, token }) {
      session.user = {
        id: token.uid ?? 0,
        email: token.email ?? "",
        name: token.name ?? "",
        role: token.role ?? "provider",
      };
      session.sv = token.sv ?? 0;
      return session;
    },
  },
};
