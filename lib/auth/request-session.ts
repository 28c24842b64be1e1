import "server-only";
import { getToken } from "next-auth/jwt";
import { rawSetting } from "@/lib/env";
import { loadSessionUser, type SessionUser } from "./load-user";

/** Cookies of a fetch Request as a plain object. */
export function cookiesOf(req: Request): Record<string, string> {
  const out: Record<string, string> = {};
  for (const part of (req.headers.get("cookie") ?? "").split(";")) {
    const eq = part.indexOf("=");
    if (eq <= 0) continue;
    const name = part.slice(0, eq).trim();
    const raw = part.slice(eq + 1).trim();
    try {
      out[name] = decodeURIComponent(raw);
    } catch {
      out[name] = raw;
    }
  }
  return out;
}

/**
 * The user behind the next-auth session cookie of a Request (route handlers), re-read
 * from the database like getCurrentUser(): inactive or an old session_version → null.
 */
export async function getSessionUserFromRequest(req: Request): Promise<SessionUser | null> {
  const secret = rawSetting("NEXTAUTH_SECRET");
  if (!secret) return null;
  // headers left empty on purpose: getToken would otherwise read a Bearer header as a JWT
  const token = await getToken({
    req: { cookies: cookiesOf(req), headers: {} } as unknown as Parameters<typeof getToken>[0]["req"],
    secret,
  });
  if (!token || typeof token.uid !== "number" || typeof token.sv !== "number") return null;
  return loadSessionUser(token.uid, token.sv);
}
