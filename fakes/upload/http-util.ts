/** Small HTTP helpers shared by the upload fake's handlers. */
import type { IncomingMessage, ServerResponse } from "node:http";

export const CORS_HEADERS: Record<string, string> = {
  "access-control-allow-origin": "*",
  "access-control-allow-methods": "GET, HEAD, PUT, POST, OPTIONS",
  "access-control-allow-headers": "content-type, range, x-uploadthing-version, b3, traceparent",
  "access-control-expose-headers": "x-ut-range-start",
  "access-control-max-age": "600",
  // Chromium's private-network preflight (harmless elsewhere)
  "access-control-allow-private-network": "true",
};

export function sendJson(
  res: ServerResponse,
  status: number,
  body: unknown,
  extra: Record<string, string> = {},
): void {
  if (res.headersSent || res.destroyed) return;
  const text = JSON.stringify(body);
  res.writeHead(status, {
    ...CORS_HEADERS,
    "content-type": "application/json; charset=utf-8",
    "content-length": String(Buffer.byteLength(text)),
    ...extra,
  });
  res.end(text);
}

export class BodyError extends Error {
  constructor(
    message: string,
    readonly status = 400,
  ) {
    super(message);
  }
}

/** Reads a request body as text, refusing more than `limit` bytes. */
export async function readText(req: IncomingMessage, limit = 1024 * 1024): Promise<string> {
  const parts: Buffer[] = [];
  let n = 0;
  for await (const c of req) {
    n += (c as Buffer).length;
    if (n > limit) throw new BodyError(`The request body is larger than ${limit} bytes.`, 413);
    parts.push(c as Buffer);
  }
  return Buffer.concat(parts).toString("utf8");
}

/** Reads and parses a JSON object body. */
export async function readJsonObject(req: IncomingMessage): Promise<Record<string, unknown>> {
  const text = await readText(req);
  let v: unknown;
  try {
    v = text === "" ? {} : JSON.parse(text);
  } catch {
    throw new BodyError("The request body is not valid JSON.");
  }
  if (v === null || typeof v !== "object" || Array.isArray(v))
    throw new BodyError("The request body must be a JSON object.");
  return v as Record<string, unknown>;
}

/** Drains and discards the rest of a request body, so the socket can answer. */
export function drain(req: IncomingMessage): void {
  req.resume();
}
