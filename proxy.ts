// Sends anonymous page visits to the sign-in page. It is never the only check: every
// page, action and route handler checks the user again (and the API answers 401 itself).
// Also gives every page its Content-Security-Policy with a fresh script nonce: Next reads
// the nonce from the request's policy header and puts it on the scripts it renders.
import { NextResponse, type NextRequest } from "next/server";
import { getToken } from "next-auth/jwt";
import { contentSecurityPolicy } from "@/lib/csp";
import { rawSetting } from "@/lib/env";

// the API reference is public like the document it draws (GET /api/v1/openapi.json)
const PUBLIC_PAGES = ["/sign-in", "/forgot-password", "/set-password", "/api-reference"];

function isPublicPage(pathname: string): boolean {
  return PUBLIC_PAGES.some((p) => pathname === p || pathname.startsWith(`${p}/`));
}

export function isPublicPath(pathname: string): boolean {
  if (pathname.startsWith("/api/") || pathname === "/api" || pathname.startsWith("/_next/")) return true;
  if (isPublicPage(pathname)) return true;
  // static files (icon.svg, favicon.ico, fonts …)
  return /\.[a-z0-9]{2,5}$/i.test(pathname);
}

export async function proxy(request: NextRequest) {
  const { pathname, search } = request.nextUrl;
  const nonce = btoa(crypto.randomUUID());
  const csp = contentSecurityPolicy({ nonce, dev: rawSetting("NODE_ENV") !== "production" });
  const withCsp = (res: NextResponse) => {
    res.headers.set("Content-Security-Policy", csp);
    return res;
  };
  // static files and API answers render no page
  if (isPublicPath(pathname) && !isPublicPage(pathname)) return withCsp(NextResponse.next());
  if (!isPublicPage(pathname)) {
    const secret = rawSetting("NEXTAUTH_SECRET");
    const token = secret ? await getToken({ req: request, secret }) : null;
    if (!token) {
      const signIn = new URL("/sign-in", request.url);
      signIn.searchParams.set("callbackUrl", `${pathname}${search}`);
      return withCsp(NextResponse.redirect(signIn));
    }
  }
  const headers = new Headers(request.headers);
  headers.set("x-nonce", nonce);
  headers.set("Content-Security-Policy", csp);
  return withCsp(NextResponse.next({ request: { headers } }));
}

export const config = {
  matcher: ["/((?!api/|_next/static|_next/image|favicon.ico).*)"],
};
