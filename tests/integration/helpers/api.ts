/** Calling v1 route handlers directly with fetch Requests, as Next does. */
import { expect } from "vitest";

type Handler<P> = (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;

export type Caller = { cookie?: string; bearer?: string };

export async function call<P extends Record<string, string> = Record<string, never>>(
  handler: Handler<P>,
  opts: { method?: string; path: string; params?: P; as?: Caller; body?: unknown; contentType?: string },
): Promise<{
  status: number;
  /** `{ data }`, or RFC 9457 problem details (lib/http/respond.ts) */
  json: {
    data?: unknown;
    type?: string;
    title?: string;
    status?: number;
    detail?: string;
    instance?: string;
    code?: string;
    errors?: Record<string, string[]>;
  };
  headers: Headers;
}> {
  const headers = new Headers();
  if (opts.as?.cookie) headers.set("cookie", opts.as.cookie);
  if (opts.as?.bearer) headers.set("authorization", `Bearer ${opts.as.bearer}`);
  if (opts.body !== undefined) headers.set("content-type", opts.contentType ?? "application/json");
  const req = new Request(`http://127.0.0.1:3410${opts.path}`, {
    method: opts.method ?? "GET",
    headers,
    body:
      opts.body === undefined
        ? undefined
        : typeof opts.body === "string"
          ? opts.body
          : JSON.stringify(opts.body),
  });
  const res = await handler(req, { params: Promise.resolve((opts.params ?? {}) as P) });
  // refusals are problem details (RFC 9457 §3), everything else JSON
  expect(res.headers.get("content-type") ?? "").toMatch(
    res.status >= 400 ? /^application\/problem\+json/ : /^application\/json/,
  );
  return { status: res.status, json: await res.json(), headers: res.headers };
}

/** Asserts the problem details and that nothing internal (stack, SQL, driver codes) leaked into it. */
export function expectSafeError(json: unknown, code: string): void {
  const body = json as { code?: string; detail?: string };
  expect(body.code).toBe(code);
  expect(typeof body.detail).toBe("string");
  const text = JSON.stringify(json);
  expect(text).not.toMatch(
    /\bat [\w.<>]+ \(|node_modules|ER_[A-Z_]+|SELECT |INSERT |sqlMessage|password_hash|passwordHash/i,
  );
}
