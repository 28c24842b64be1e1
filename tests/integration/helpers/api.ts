/** Calling v1 route handlers directly with fetch Requests, as Next does. */
import { expect } from "vitest";

type Handler<P> = (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;

export type Caller = { cookie?: string; bearer?: string };

export async function call<P extends Record<string, string> = Record<string, never>>(
  handler: Handler<P>,
  opts: { method?: string; path: string; params?: P; as?: Caller; body?: unknown },
): Promise<{
  status: number;
  json: { data?: unknown; error?: { code: string; message: string; fieldErrors?: Record<string, string[]> } };
}> {
  const headers = new Headers();
  if (opts.as?.cookie) headers.set("cookie", opts.as.cookie);
  if (opts.as?.bearer) headers.set("authorization", `Bearer ${opts.as.bearer}`);
  if (opts.body !== undefined) headers.set("content-type", "application/json");
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
  expect(res.headers.get("content-type") ?? "").toContain("application/json");
  return { status: res.status, json: await res.json() };
}

/** Asserts the error envelope and that nothing internal (stack, SQL, driver codes) leaked into it. */
export function expectSafeError(json: unknown, code: string): void {
  const body = json as { error?: { code?: string; message?: string } };
  expect(body.error?.code).toBe(code);
  expect(typeof body.error?.message).toBe("string");
  const text = JSON.stringify(json);
  expect(text).not.toMatch(
    /\bat [\w.<>]+ \(|node_modules|ER_[A-Z_]+|SELECT |INSERT |sqlMessage|password_hash|passwordHash/i,
  );
}
