/**
 * Session cookies when the app is served over https (NEXTAUTH_URL https://…): a real
 * sign-in through next-auth with our authOptions sets `__Secure-next-auth.session-token` and
 * `__Host-next-auth.csrf-token`, each HttpOnly, Secure, SameSite=Lax, Path=/ (the cookie
 * prefixes of RFC 6265bis §4.1.3); the API reads the session back from that cookie name.
 * The plain-http case (the demo on loopback) is checked against the running server in
 * tests/e2e/security.spec.ts.
 */
import { afterAll, describe, expect, it, vi } from "vitest";

vi.mock("server-only", () => ({}));

// before authOptions is built: it reads the address once, as the server does at start
process.env.NEXTAUTH_URL = "https://tributary.example.org";
const { authOptions, secureCookiesFor } = await import("@/lib/auth/options");
const { GET: getMe } = await import("@/app/api/v1/me/route");
const { getPool } = await import("@/db/client");
const { resetRateLimits } = await import("@/lib/auth/rate-limit");
const { callNextAuth } = await import("./helpers/next-auth");
type Jar = import("./helpers/next-auth").Jar;

afterAll(async () => {
  await getPool().end();
});

const HTTPS_HEADERS = {
  host: "tributary.example.org",
  "x-forwarded-proto": "https",
  "x-forwarded-for": "192.0.2.9",
};

/** One request to next-auth as a browser reaching the app over https would send it. */
function nextAuth(action: string[], method: "GET" | "POST", jar: Jar, body?: Record<string, string>) {
  return callNextAuth(authOptions, action, method, jar, body, { headers: HTTPS_HEADERS });
}

function attributes(setCookie: string): { name: string; attrs: Set<string> } {
  const [pair, ...rest] = setCookie.split(";").map((s) => s.trim());
  return { name: pair!.slice(0, pair!.indexOf("=")), attrs: new Set(rest.map((a) => a.toLowerCase())) };
}

describe("cookies over https", () => {
  it("secureCookiesFor follows NEXTAUTH_URL's scheme", () => {
    expect(secureCookiesFor({ NEXTAUTH_URL: "https://x.example" })).toBe(true);
    expect(secureCookiesFor({ NEXTAUTH_URL: "http://127.0.0.1:3400" })).toBe(false);
    expect(secureCookiesFor({})).toBe(false);
  });

  it("a sign-in sets __Secure-/__Host- cookies, HttpOnly, Secure, SameSite=Lax; the API reads the session back", async () => {
    await resetRateLimits();
    const jar: Record<string, string> = {};
    const csrf = await nextAuth(["csrf"], "GET", jar);
    const csrfToken = (csrf.body as { csrfToken: string }).csrfToken;
    const signedIn = await nextAuth(["callback", "credentials"], "POST", jar, {
      email: "lead@lowmoor.test",
      password: "tributary-demo",
      csrfToken,
      json: "true",
    });
    const cookies = [...csrf.setCookies, ...signedIn.setCookies].map(attributes);
    const byName = new Map(cookies.map((c) => [c.name, c.attrs]));
    expect([...byName.keys()].sort()).toEqual([
      "__Host-next-auth.csrf-token",
      "__Secure-next-auth.callback-url",
      "__Secure-next-auth.session-token",
    ]);
    for (const [name, attrs] of byName) {
      for (const a of ["httponly", "secure", "samesite=lax", "path=/"])
        expect(attrs.has(a), `${name} ${a}`).toBe(true);
      // __Host- cookies must not name a domain; none of ours does
      expect([...attrs].some((a) => a.startsWith("domain="))).toBe(false);
    }
    const token = jar["__Secure-next-auth.session-token"]!;
    const me = await getMe(
      new Request("https://tributary.example.org/api/v1/me", {
        headers: { cookie: `__Secure-next-auth.session-token=${token}` },
      }),
      { params: Promise.resolve({}) },
    );
    expect(me.status).toBe(200);
    // the plain name is not read over https: a cookie set over http cannot stand in for it
    const plain = await getMe(
      new Request("https://tributary.example.org/api/v1/me", {
        headers: { cookie: `next-auth.session-token=${token}` },
      }),
      { params: Promise.resolve({}) },
    );
    expect(plain.status).toBe(401);
  });
});
