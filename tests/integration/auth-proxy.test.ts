/** proxy.ts: anonymous page visits go to sign-in with their address kept; the API, sign-in and assets pass. */
import { NextRequest } from "next/server";
import { describe, expect, test, vi } from "vitest";

vi.mock("server-only", () => ({}));
import { config, isPublicPath, proxy } from "@/proxy";
import { forgedSessionCookie, sessionCookieFor } from "./helpers/session";

const BASE = "http://127.0.0.1:3410";
const user = {
  id: 1,
  email: "x@f3a.test",
  name: "X",
  role: "admin" as const,
  organisationId: null,
  sessionVersion: 1,
};

function visit(path: string, cookie?: string): NextRequest {
  return new NextRequest(new URL(path, BASE), { headers: cookie ? { cookie } : {} });
}

// NextResponse.next() marks "carry on" with this header; a redirect has a Location
const passes = (res: Response) =>
  res.headers.get("x-middleware-next") === "1" && !res.headers.get("location");

describe("proxy", () => {
  test("an anonymous page visit is sent to /sign-in with callbackUrl holding path and query", async () => {
    const res = await proxy(visit("/batches/abc?tab=findings"));
    expect(res.status).toBe(307);
    const to = new URL(res.headers.get("location")!);
    expect(to.pathname).toBe("/sign-in");
    expect(to.searchParams.get("callbackUrl")).toBe("/batches/abc?tab=findings");
  });

  test("the home page is not public", async () => {
    expect((await proxy(visit("/"))).status).toBe(307);
  });

  test.each([
    "/sign-in",
    "/api/v1/me",
    "/api/auth/session",
    "/_next/static/chunks/app.js",
    "/icon.svg",
    "/fonts/source-sans-3.woff2",
  ])("%s passes without a session", async (path) => {
    expect(isPublicPath(path)).toBe(true);
    expect(passes(await proxy(visit(path)))).toBe(true);
  });

  test("a page visit with a valid session cookie passes; a forged one is redirected", async () => {
    expect(passes(await proxy(visit("/studies", await sessionCookieFor(user))))).toBe(true);
    expect((await proxy(visit("/studies", await forgedSessionCookie(user)))).status).toBe(307);
  });

  test("pages that merely start like a public path are not public", () => {
    expect(isPublicPath("/sign-inside")).toBe(false);
    expect(isPublicPath("/apis")).toBe(false);
  });

  test("the matcher keeps the proxy off the API and Next's static files", () => {
    const source = config.matcher[0]!;
    const re = new RegExp(`^${source}$`);
    expect(re.test("/studies")).toBe(true);
    expect(re.test("/api/v1/me")).toBe(false);
    expect(re.test("/_next/static/x.js")).toBe(false);
  });
});
