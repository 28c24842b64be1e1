// Sends anonymous page visits to the sign-in page. It is never the only check: every
// page, action and route handler checks the user again (and the API answers 401 itself).
import { NextResponse, type NextRequest } from "next/server";
import { getToken } from "next-auth/jwt";

const PUBLIC_PAGES = ["/sign-in", "/forgot-password", "/set-password"];

export function isPublicPath(pathname: string): boolean {
  if (pathname.startsWith("/api/") || pathname === "/api" || pathname.startsWith("/_next/")) return true;
  if (PUBLIC_PAGES.some((p) => pathname === p || pathname.startsWith(`${p}/`))) return true;
  // static files (icon.svg, favicon.ico, fonts …)
  return /\.[a-z0-9]{2,5}$/i.test(pathname);
}

export async function proxy(request: NextRequest) {
  const { pathname, search } = request.nextUrl;
  if (isPublicPath(pathname)) return NextResponse.next();
  const secret = process.env.NEXTAUTH_SECRET;
  const token = secret ? await getToken({ req: request, secret }) : null;
  if (token) return NextResponse.next();
  const signIn = new URL("/sign-in", request.url);
  signIn.searchParams.set("callbackUrl", `${pathname}${search}`);
  return NextResponse.redirect(signIn);
}

export const config = {
  matcher: ["/((?!api/|_next/static|_next/image|favicon.ico).*)"],
};
