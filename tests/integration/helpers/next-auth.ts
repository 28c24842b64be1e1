/**
 * One request to next-auth v4 with our authOptions, through its request/response entry (the
 * pages-API form, which hands the request to the same core as app/api/auth/[...nextauth]).
 * Cookies it sets go into `jar` (an empty value clears one).
 */
import NextAuth, { type AuthOptions } from "next-auth";

export type Jar = Record<string, string>;
export type NextAuthReply = { status: number; body: unknown; redirect?: string; setCookies: string[] };

export async function callNextAuth(
  options: AuthOptions,
  action: string[],
  method: "GET" | "POST",
  jar: Jar,
  body?: Record<string, string>,
  extra: { query?: Record<string, string>; headers?: Record<string, string> } = {},
): Promise<NextAuthReply> {
  const reply: NextAuthReply = { status: 200, body: undefined, setCookies: [] };
  const headers: Record<string, string[] | string> = {};
  const res = {
    status(code: number) {
      reply.status = code;
      return res;
    },
    getHeader: (name: string) => headers[name],
    setHeader(name: string, value: string[] | string) {
      headers[name] = value;
      if (name.toLowerCase() === "location") reply.redirect = String(value);
      return res;
    },
    send(b: unknown) {
      reply.body = b;
    },
    json(b: unknown) {
      reply.body = b;
    },
    end() {},
  };
  const req = {
    query: { ...extra.query, nextauth: action },
    method,
    body,
    cookies: { ...jar },
    headers: { ...extra.headers, ...(body ? { "content-type": "application/x-www-form-urlencoded" } : {}) },
  };
  await (NextAuth as unknown as (req: unknown, res: unknown, o: AuthOptions) => Promise<void>)(
    req,
    res,
    options,
  );
  for (const c of [headers["Set-Cookie"] ?? []].flat()) {
    reply.setCookies.push(c);
    const [pair] = c.split(";");
    const at = pair!.indexOf("=");
    const value = decodeURIComponent(pair!.slice(at + 1));
    if (value) jar[pair!.slice(0, at)] = value;
    else delete jar[pair!.slice(0, at)];
  }
  if (body?.json === "true" && reply.body && typeof reply.body === "object" && "url" in reply.body)
    reply.redirect = String((reply.body as { url: string }).url);
  return reply;
}
