import "server-only";
import { lookupApiToken } from "@/lib/auth/api-tokens";
import { requireWithinLimits } from "@/lib/auth/rate-limit";
import { can, type Action } from "@/lib/auth/permissions";
import { getSessionUserFromRequest } from "@/lib/auth/request-session";
import type { SessionUser } from "@/lib/auth/session";
import { rawSetting } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { errorResponse } from "./respond";

export type ApiActor = SessionUser & { via: "session" | "token" };

/**
 * The caller of an API request: a Bearer API token when one is sent (it must be valid),
 * otherwise the next-auth session cookie. Throws AppError("unauthenticated").
 */
export async function getApiActor(req: Request): Promise<ApiActor> {
  const auth = req.headers.get("authorization");
  if (auth) {
    const [scheme, token] = auth.split(/\s+/, 2);
    if (scheme?.toLowerCase() !== "bearer" || !token)
      throw new AppError("unauthenticated", "Send an API token as 'Authorization: Bearer <token>'.");
    const found = await lookupApiToken(token);
    if (!found.ok) {
      const message =
        found.reason === "revoked"
          ? "This API token has been revoked. Create a new one on your account page."
          : found.reason === "inactive"
            ? "The account this API token belongs to is not active."
            : "This API token is not valid.";
      throw new AppError("unauthenticated", message);
    }
    // counted in the database, so a token's calls to every instance count together (429 past it)
    await requireWithinLimits(
      [{ name: "apiPerToken", subject: `token:${found.tokenId}` }],
      "API calls with this token",
    );
    return { ...found.user, via: "token" };
  }
  const user = await getSessionUserFromRequest(req);
  if (!user)
    throw new AppError(
      "unauthenticated",
      "Sign in, or send an API token as 'Authorization: Bearer <token>'.",
    );
  return { ...user, via: "session" };
}

type RouteContext<P> = { params: Promise<P> };

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Cookie-authenticated changes must come from our own pages. SameSite=Lax cookies already
 * keep most cross-site requests out; this refuses the rest when the browser names the origin.
 */
function assertSameOrigin(req: Request): void {
  const origin = req.headers.get("origin");
  if (!origin || SAFE_METHODS.has(req.method)) return;
  const allowed = new Set([new URL(req.url).origin]);
  for (const url of [rawSetting("APP_URL"), rawSetting("NEXTAUTH_URL")]) {
    if (url) allowed.add(new URL(url).origin);
  }
  if (!allowed.has(origin))
    throw new AppError("forbidden", "Requests from other sites are refused; use an API token for scripts.");
}

/**
 * Wraps a v1 route handler in the house order: who is calling (401) → may their role do
 * this (403) → the handler parses input (400/415/422), loads within the caller's scope (404) and
 * acts. Refusals come before input checks so they never depend on the body. Errors become
 * problem details (lib/http/respond.ts); unexpected ones are logged and answered with a plain 500.
 */
export function apiRoute<P extends Record<string, string | string[]> = Record<string, never>>(
  options: { action?: Action },
  handler: (args: { req: Request; actor: ApiActor; params: P }) => Promise<Response>,
): (req: Request, ctx: RouteContext<P>) => Promise<Response> {
  return async (req, ctx) => {
    try {
      const actor = await getApiActor(req);
      if (actor.via === "session") assertSameOrigin(req);
      if (options.action && !can(actor.role, options.action)) throw new AppError("forbidden");
      const params = ((await ctx?.params) ?? {}) as P;
      return await handler({ req, actor, params });
    } catch (e) {
      return errorResponse(e, req);
    }
  };
}
