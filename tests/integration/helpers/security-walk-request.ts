/**
 * A request scope for code that reads `next/headers` outside Next: server actions (through
 * next-auth's getServerSession), the next-auth route and the upload route. next-auth loads
 * `next/headers` with require() at call time, so the module's CommonJS exports are replaced
 * here (vi.mock only reaches ES imports); cookies() and headers() then carry the cookie of
 * the caller set with `actAs`, and next-auth decodes it for real.
 */
import { createRequire } from "node:module";

type CookieEntry = { name: string; value: string };

let current: { cookie: string } = { cookie: "" };

function parse(cookie: string): CookieEntry[] {
  return cookie
    .split(";")
    .map((p) => p.trim())
    .filter(Boolean)
    .map((p) => {
      const eq = p.indexOf("=");
      return { name: p.slice(0, eq), value: decodeURIComponent(p.slice(eq + 1)) };
    });
}

/** What `cookies()` gives: read-only access to the current caller's cookies. */
export function fakeCookies() {
  const all = parse(current.cookie);
  return {
    getAll: () => all,
    get: (name: string) => all.find((c) => c.name === name),
    has: (name: string) => all.some((c) => c.name === name),
    set: () => undefined,
    delete: () => undefined,
  };
}

/** What `headers()` gives: the host and the caller's cookie header. */
export function fakeHeaders(): Headers {
  const h = new Headers({ host: "127.0.0.1:3410", "x-forwarded-for": "192.0.2.80" });
  if (current.cookie) h.set("cookie", current.cookie);
  return h;
}

/** Replaces `next/headers` as CommonJS sees it (next-auth's require) with the fakes above. */
export function installFakeNextHeaders(): void {
  const mod = createRequire(import.meta.url)("next/headers") as Record<string, unknown>;
  mod.cookies = async () => fakeCookies();
  mod.headers = async () => fakeHeaders();
}

/** Sets the caller for the next cookies()/headers() reads; "" is anonymous. */
export function actAs(cookie: string): void {
  current = { cookie };
}

/** The digest Next gives a redirect() throw: `NEXT_REDIRECT;<type>;<url>;<status>;`. */
export function redirectTarget(e: unknown): string | null {
  const digest = (e as { digest?: unknown })?.digest;
  if (typeof digest !== "string" || !digest.startsWith("NEXT_REDIRECT")) return null;
  return digest.split(";")[2] ?? "";
}
