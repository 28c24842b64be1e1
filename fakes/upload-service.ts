/**
 * A local stand-in for the hosted upload service that the `uploadthing` SDK talks to
 * (protocol in fakes/UPLOADS.md). The real SDK runs unmodified against it; only
 * UPLOADTHING_INGEST_URL / UPLOADTHING_API_URL point here. Files live on disk under
 * `dir` and survive a restart.
 */
import { createReadStream } from "node:fs";
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import { timingSafeEqual } from "node:crypto";
import { handleApi } from "./upload/api";
import { BodyError, CORS_HEADERS, drain, readJsonObject, sendJson } from "./upload/http-util";
import { handleHead, handlePut, type IngestContext, requestUrl } from "./upload/ingest";
import { checkSignedUrl } from "./upload/signing";
import { IngestState, type DevStream, type Registration } from "./upload/state";
import { FileStore, isValidKey } from "./upload/store";

export type UploadFakeOptions = {
  /** 0 picks a free port */
  port: number;
  /** the api key the SDK signs with (from UPLOADTHING_TOKEN) */
  apiKey: string;
  /** where files and their metadata are kept */
  dir: string;
  /** when set, presigned URLs must be signed for this app id */
  appId?: string;
  host?: string;
  /** base URL announced to the app and used in file URLs; default http://<host>:<port> */
  publicUrl?: string;
  /** how long a PUT waits for the app's /callback-result (default 30 s) */
  callbackTimeoutMs?: number;
  /** production mode: how long after the app answered the callback a missing result means failure (default 5 s) */
  callbackGraceMs?: number;
  /** how long a PUT carrying a slug waits for the app's /route-metadata (default 5 s) */
  registrationWaitMs?: number;
  /** how long a dev-mode /route-metadata stream may stay open (default 15 min) */
  devStreamTimeoutMs?: number;
  /** cap for uploads that do not announce their size (default 1 GiB) */
  maxUploadBytes?: number;
  log?: (msg: string) => void;
};

export type UploadFake = { url: string; port: number; close(): Promise<void> };

export type UploadToken = { apiKey: string; appId: string; regions: string[] };

/** Decodes UPLOADTHING_TOKEN (base64 JSON {apiKey, appId, regions}). */
export function parseUploadToken(token: string): UploadToken {
  let v: unknown;
  try {
    v = JSON.parse(Buffer.from(token, "base64").toString("utf8"));
  } catch {
    throw new Error("UPLOADTHING_TOKEN is not base64-encoded JSON.");
  }
  const t = v as Partial<UploadToken>;
  if (typeof t.apiKey !== "string" || !t.apiKey.startsWith("sk_"))
    throw new Error("UPLOADTHING_TOKEN: apiKey must start with sk_.");
  if (typeof t.appId !== "string" || t.appId === "") throw new Error("UPLOADTHING_TOKEN: appId is missing.");
  if (!Array.isArray(t.regions) || t.regions.length === 0)
    throw new Error("UPLOADTHING_TOKEN: regions must be a non-empty list.");
  return { apiKey: t.apiKey, appId: t.appId, regions: t.regions.map(String) };
}

function sameSecret(given: string | string[] | undefined, want: string): boolean {
  if (typeof given !== "string") return false;
  const a = Buffer.from(given);
  const b = Buffer.from(want);
  return a.length === b.length && timingSafeEqual(a, b);
}

type Ctx = IngestContext & { devStreamTimeoutMs: number };

async function handleRouteMetadata(req: IncomingMessage, res: ServerResponse, ctx: Ctx): Promise<void> {
  const body = await readJsonObject(req);
  const keys = body.fileKeys;
  if (
    !Array.isArray(keys) ||
    keys.length === 0 ||
    !keys.every((k) => typeof k === "string" && isValidKey(k))
  ) {
    return sendJson(res, 400, { error: "`fileKeys` must be a non-empty list of file keys." });
  }
  if (typeof body.callbackUrl !== "string" || !URL.canParse(body.callbackUrl)) {
    return sendJson(res, 400, { error: "`callbackUrl` must be an absolute URL." });
  }
  if (typeof body.callbackSlug !== "string" || body.callbackSlug === "") {
    return sendJson(res, 400, { error: "`callbackSlug` is missing." });
  }
  const metadata =
    body.metadata && typeof body.metadata === "object" ? (body.metadata as Record<string, unknown>) : {};
  const isDev = body.isDev === true;
  let stream: DevStream | null = null;
  if (isDev) {
    res.writeHead(200, { "content-type": "application/x-ndjson", "cache-control": "no-store" });
    res.flushHeaders();
    const s: DevStream = {
      res,
      pending: new Set(keys as string[]),
      closed: false,
      timer: setTimeout(() => ctx.state.endStream(s), ctx.devStreamTimeoutMs),
    };
    res.on("close", () => {
      s.closed = true;
      clearTimeout(s.timer);
      ctx.state.streams.delete(s);
    });
    ctx.state.streams.add(s);
    stream = s;
  }
  const reg: Registration = {
    metadata,
    isDev,
    callbackUrl: body.callbackUrl,
    callbackSlug: body.callbackSlug,
    awaitServerData: body.awaitServerData !== false,
    stream,
    createdAt: Date.now(),
  };
  ctx.state.register(keys as string[], reg);
  if (!isDev) sendJson(res, 200, { ok: true });
}

async function handleCallbackResult(req: IncomingMessage, res: ServerResponse, ctx: Ctx): Promise<void> {
  const body = await readJsonObject(req);
  if (typeof body.fileKey !== "string") return sendJson(res, 400, { error: "`fileKey` is missing." });
  if (typeof body.error === "string") ctx.state.settle(body.fileKey, { ok: false, error: body.error });
  else ctx.state.settle(body.fileKey, { ok: true, serverData: body.callbackData ?? null });
  sendJson(res, 200, { ok: true });
}

function contentDisposition(kind: string, name: string): string {
  const ascii = name.replace(/[^\x20-\x7e]/g, "_").replace(/["\\]/g, "_");
  return `${kind}; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`;
}

async function handleDownload(
  req: IncomingMessage,
  res: ServerResponse,
  key: string,
  ctx: Ctx,
): Promise<void> {
  const f = await ctx.store.get(key);
  if (!f) return sendJson(res, 404, { error: "No such file." });
  if (f.acl === "private") {
    const check = checkSignedUrl(requestUrl(req), ctx.apiKey);
    if (!check.ok) return sendJson(res, 403, { error: `This file is private: ${check.message}` });
  }
  res.writeHead(200, {
    ...CORS_HEADERS,
    "content-type": f.type,
    "content-length": String(f.size),
    "content-disposition": contentDisposition(f.contentDisposition, f.name),
    etag: `"${f.fileHash}"`,
    "cache-control": f.acl === "private" ? "private, no-store" : "public, max-age=31536000, immutable",
  });
  if (req.method === "HEAD") return void res.end();
  const rs = createReadStream(ctx.store.bytesPath(key));
  rs.on("error", () => res.destroy());
  rs.pipe(res);
}

async function route(req: IncomingMessage, res: ServerResponse, ctx: Ctx): Promise<void> {
  const method = req.method ?? "GET";
  const pathname = new URL(req.url ?? "/", "http://fake").pathname;
  if (method === "OPTIONS") {
    res.writeHead(204, CORS_HEADERS);
    return void res.end();
  }
  const parts = pathname.split("/").filter(Boolean);
  if ((method === "GET" || method === "HEAD") && parts[0] === "f" && parts.length === 2) {
    return handleDownload(req, res, parts[1]!, ctx);
  }
  if ((method === "GET" || method === "HEAD") && parts[0] === "a" && parts.length === 3) {
    if (ctx.appId && parts[1] !== ctx.appId) return sendJson(res, 404, { error: "No such app." });
    return handleDownload(req, res, parts[2]!, ctx);
  }
  if (method === "POST") {
    if (!sameSecret(req.headers["x-uploadthing-api-key"], ctx.apiKey)) {
      drain(req);
      return sendJson(res, 401, { error: "Invalid or missing x-uploadthing-api-key." });
    }
    if (pathname === "/route-metadata") return handleRouteMetadata(req, res, ctx);
    if (pathname === "/callback-result") return handleCallbackResult(req, res, ctx);
    if (pathname.startsWith("/v6/")) {
      const r = await handleApi(pathname, await readJsonObject(req), {
        store: ctx.store,
        apiKey: ctx.apiKey,
        base: ctx.base,
      });
      return sendJson(res, r.status, r.json);
    }
  }
  if (parts.length === 1 && method === "HEAD") return handleHead(req, res, parts[0]!, ctx);
  if (parts.length === 1 && method === "PUT") return handlePut(req, res, parts[0]!, ctx);
  drain(req);
  sendJson(res, 404, { error: `Nothing at ${method} ${pathname}.` });
}

/** Starts the upload fake and resolves once it listens. */
export async function startUploadFake(opts: UploadFakeOptions): Promise<UploadFake> {
  const store = new FileStore(opts.dir);
  await store.init();
  const host = opts.host ?? "127.0.0.1";
  const ctx: Ctx = {
    store,
    state: new IngestState(),
    apiKey: opts.apiKey,
    appId: opts.appId,
    base: "",
    callbackTimeoutMs: opts.callbackTimeoutMs ?? 30_000,
    callbackGraceMs: opts.callbackGraceMs ?? 5_000,
    registrationWaitMs: opts.registrationWaitMs ?? 5_000,
    devStreamTimeoutMs: opts.devStreamTimeoutMs ?? 15 * 60_000,
    maxUploadBytes: opts.maxUploadBytes ?? 1024 ** 3,
    log: opts.log ?? ((m) => console.error(m)),
  };
  const server = createServer((req, res) => {
    route(req, res, ctx).catch((e: unknown) => {
      if (e instanceof BodyError) return sendJson(res, e.status, { error: e.message });
      ctx.log(`upload fake: ${req.method} ${req.url}: ${(e as Error).stack ?? e}`);
      if (!res.headersSent) sendJson(res, 500, { error: "The upload fake failed; see its log." });
      else res.destroy();
    });
  });
  // large uploads from a slow client may take a while; held PUTs end by callbackTimeoutMs
  server.requestTimeout = 30 * 60_000;
  server.headersTimeout = 60_000;
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, host, () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  ctx.base = (opts.publicUrl ?? `http://${host}:${port}`).replace(/\/$/, "");
  return {
    url: ctx.base,
    port,
    close: () =>
      new Promise<void>((resolve) => {
        ctx.state.shutdown();
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
