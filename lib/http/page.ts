/**
 * One shape for every list of the v1 API (batches, queue, audit trail, tokens, users):
 * `?limit=` (default PAGE_SIZE, at most PAGE_MAX) and `?cursor=`, answered as
 * `{ data: [...], next }` where `next` is the address of the following page (null on the last),
 * also sent as an RFC 8288 `Link: <…>; rel="next"` header. The cursor is opaque to clients:
 * base64url (RFC 4648 §5) of the list's name and the last row's sort key (lib/http/keyset.ts).
 */
import { z } from "zod";
import { AppError } from "@/lib/errors";
import type { KeysetList, KeyValue, Page } from "./keyset";

export const PAGE_SIZE = 100;
export const PAGE_MAX = 500;

const LIMIT_RULE = `limit is a whole number from 1 to ${PAGE_MAX}; follow \`next\` for the rows after.`;

/** `cursor` and `limit`, spread into the query schema of each list route (lib/http/queries.ts). */
export const pageParams = {
  cursor: z
    .string()
    .max(400, "cursor is the value from the `next` address of the page before; send it unchanged.")
    .optional()
    .meta({ description: "Where the page starts: taken from the `next` address of the page before." }),
  limit: z.coerce
    .number({ error: LIMIT_RULE })
    .int(LIMIT_RULE)
    .min(1, LIMIT_RULE)
    .max(PAGE_MAX, LIMIT_RULE)
    .default(PAGE_SIZE)
    .meta({ description: `Rows per page: ${PAGE_SIZE} unless asked, at most ${PAGE_MAX}.` }),
};

const BAD_CURSOR =
  "The cursor is not one this list gave out. Follow the `next` address of the previous page unchanged, or leave cursor out to start at the first page.";

/** The cursor of the page after `key` in `list`. */
export function encodeCursor<K extends KeyValue[]>(list: KeysetList<K>, key: K): string {
  const parts = key.map((v) => (v instanceof Date ? v.toISOString() : v));
  return Buffer.from(JSON.stringify([list.name, ...parts]), "utf8").toString("base64url");
}

function keyPart(kind: "date" | "int" | "text", v: unknown): KeyValue | undefined {
  if (kind === "int") return Number.isSafeInteger(v) ? (v as number) : undefined;
  if (kind === "text") return typeof v === "string" ? v : undefined;
  if (typeof v !== "string" || !/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/.test(v)) return undefined;
  const d = new Date(v);
  return Number.isNaN(d.getTime()) ? undefined : d;
}

/** The key a cursor carries, checked against `list`; undefined without a cursor; 400 for any other text. */
export function decodeCursor<K extends KeyValue[]>(
  list: KeysetList<K>,
  cursor: string | undefined,
): K | undefined {
  if (cursor === undefined) return undefined;
  let parsed: unknown;
  try {
    if (!/^[A-Za-z0-9_-]+$/.test(cursor)) throw new Error("not base64url");
    parsed = JSON.parse(Buffer.from(cursor, "base64url").toString("utf8"));
  } catch {
    throw new AppError("bad_request", BAD_CURSOR);
  }
  const parts = list.parts as readonly ("date" | "int" | "text")[];
  if (!Array.isArray(parsed) || parsed.length !== parts.length + 1 || parsed[0] !== list.name)
    throw new AppError("bad_request", BAD_CURSOR);
  const key = parts.map((kind, i) => keyPart(kind, parsed[i + 1]));
  if (key.some((v) => v === undefined)) throw new AppError("bad_request", BAD_CURSOR);
  return key as K;
}

/**
 * The address of the page after `page` (null on the last): `path` with the query of the request
 * (filters, limit) kept and the cursor replaced. Relative to the server, like `Location`.
 */
export function nextHref<K extends KeyValue[]>(
  path: string,
  query: URLSearchParams,
  list: KeysetList<K>,
  page: Page<unknown, K>,
): string | null {
  if (!page.nextKey) return null;
  const q = new URLSearchParams(query);
  q.set("cursor", encodeCursor(list, page.nextKey));
  return `${path}?${q.toString()}`;
}

/** A list page as the API answers it: `{ data, next }` and, when a next page exists, the RFC 8288 Link header. */
export function pageResponse<K extends KeyValue[]>(
  req: Request,
  list: KeysetList<K>,
  page: Page<unknown, K>,
): Response {
  const url = new URL(req.url);
  const next = nextHref(url.pathname, url.searchParams, list, page);
  const headers: Record<string, string> = { "cache-control": "no-store" };
  if (next) headers.link = `<${next}>; rel="next"`;
  return Response.json({ data: page.rows, next }, { headers });
}
