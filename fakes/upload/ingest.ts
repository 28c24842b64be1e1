/**
 * The ingest side of the upload fake: the client's HEAD and PUT on a presigned URL,
 * the signed callback to the app (POST in production mode, a line on the open
 * /route-metadata stream in dev mode), and the held PUT answered once the app
 * posts /callback-result (fakes/UPLOADS.md "One upload, step by step").
 */
import type { IncomingMessage, ServerResponse } from "node:http";
import { isMultipartWithBoundary, MultipartError, NOT_MULTIPART, receiveMultipartFile } from "./multipart";
import { CORS_HEADERS, drain, sendJson } from "./http-util";
import { checkSignedUrl, sign, utParam } from "./signing";
import { IngestState, type Registration } from "./state";
import { type Acl, type FileStore, isValidKey, type StoredFile } from "./store";
import { fileUrl } from "./api";

export type IngestContext = {
  store: FileStore;
  state: IngestState;
  apiKey: string;
  /** when set, the signed `x-ut-identifier` must match */
  appId?: string;
  base: string;
  callbackTimeoutMs: number;
  /** production mode: wait this long for /callback-result after the app answered the callback */
  callbackGraceMs: number;
  registrationWaitMs: number;
  /** uploads without a declared size are capped at this many bytes */
  maxUploadBytes: number;
  log: (msg: string) => void;
};

/** The full URL as the client addressed it; the SDK signs exactly this text. */
export function requestUrl(req: IncomingMessage): string {
  return `http://${req.headers.host ?? "127.0.0.1"}${req.url ?? "/"}`;
}

function reject(req: IncomingMessage, res: ServerResponse, status: number, message: string): void {
  sendJson(res, status, { error: message });
  drain(req);
}

export function handleHead(req: IncomingMessage, res: ServerResponse, key: string, ctx: IngestContext): void {
  const check = checkSignedUrl(requestUrl(req), ctx.apiKey);
  const status = !isValidKey(key) ? 404 : check.ok ? 200 : check.status;
  res.writeHead(status, { ...CORS_HEADERS, "x-ut-range-start": "0" });
  res.end();
}

function urls(ctx: IngestContext, key: string, appId: string) {
  const u = fileUrl(ctx.base, key);
  return { url: u, appUrl: `${ctx.base}/a/${appId}/${key}`, ufsUrl: u };
}

async function postHook(
  ctx: IngestContext,
  reg: Registration,
  hook: "callback" | "error",
  payload: string,
): Promise<string | null> {
  const url = new URL(reg.callbackUrl);
  url.searchParams.set("slug", reg.callbackSlug);
  try {
    const r = await fetch(url, {
      method: "POST",
      headers: {
        "content-type": "application/json",
        "uploadthing-hook": hook,
        "x-uploadthing-signature": sign(payload, ctx.apiKey),
      },
      body: payload,
      signal: AbortSignal.timeout(ctx.callbackTimeoutMs),
    });
    const text = await r.text();
    if (!r.ok) return `The app answered the ${hook} hook with HTTP ${r.status}: ${text.slice(0, 300)}`;
    return null;
  } catch (e) {
    return `The ${hook} hook to ${url.origin}${url.pathname} failed: ${(e as Error).message}`;
  }
}

/** Sends a hook to the app: on the dev stream, or as a POST. Returns an error text or null. */
async function deliver(
  ctx: IngestContext,
  reg: Registration,
  hook: "callback" | "error",
  payload: string,
): Promise<string | null> {
  if (!reg.isDev) return postHook(ctx, reg, hook, payload);
  const s = reg.stream;
  if (!s || s.closed || s.res.destroyed) return "The app's dev stream for this upload is no longer open.";
  s.res.write(JSON.stringify({ payload, signature: sign(payload, ctx.apiKey), hook }) + "\n");
  return null;
}

async function reportError(
  ctx: IngestContext,
  key: string,
  reg: Registration | null,
  message: string,
): Promise<void> {
  if (!reg) return;
  const err = await deliver(ctx, reg, "error", JSON.stringify({ fileKey: key, error: message }));
  if (err) ctx.log(`upload fake: ${err}`);
  ctx.state.finish(key);
}

export async function handlePut(
  req: IncomingMessage,
  res: ServerResponse,
  key: string,
  ctx: IngestContext,
): Promise<void> {
  if (!isValidKey(key)) return reject(req, res, 404, "That is not a file key.");
  const check = checkSignedUrl(requestUrl(req), ctx.apiKey);
  if (!check.ok) return reject(req, res, check.status, check.message);
  const p = check.params;
  const identifier = utParam(p, "x-ut-identifier") ?? "";
  if (ctx.appId && identifier !== ctx.appId)
    return reject(req, res, 403, "The URL was signed for another app.");
  const range = /^bytes=(\d+)-$/.exec(String(req.headers.range ?? "bytes=0-"));
  if (!range || range[1] !== "0")
    return reject(req, res, 416, "Only whole uploads are accepted (Range: bytes=0-).");
  const contentType = req.headers["content-type"];
  if (!isMultipartWithBoundary(contentType)) return reject(req, res, 400, NOT_MULTIPART);
  if (ctx.state.uploading.has(key)) return reject(req, res, 409, "This file key is being uploaded already.");

  const slug = utParam(p, "x-ut-slug");
  ctx.state.uploading.add(key);
  let reg: Registration | null = null;
  const temp = ctx.store.tempPath(key);
  try {
    if (await ctx.store.get(key)) return reject(req, res, 409, "This file key has already been uploaded.");
    if (slug) {
      reg = await ctx.state.waitForRegistration(key, ctx.registrationWaitMs);
      if (!reg)
        return reject(
          req,
          res,
          400,
          "The app did not register this upload (no /route-metadata for its key).",
        );
    }
    const declared = Number(utParam(p, "x-ut-file-size"));
    const hasSize = Number.isInteger(declared) && declared >= 0;
    let got;
    try {
      got = await receiveMultipartFile(req, contentType, temp, hasSize ? declared : ctx.maxUploadBytes);
    } catch (e) {
      await ctx.store.discard(temp);
      if (!(e instanceof MultipartError)) {
        // the client went away (or paused): keep the registration so it can PUT again
        return reject(req, res, 400, `The upload was interrupted: ${(e as Error).message}`);
      }
      await reportError(ctx, key, reg, e.message);
      return reject(req, res, e.status, e.message);
    }
    if (hasSize && got.size !== declared) {
      await ctx.store.discard(temp);
      const message = `The file has ${got.size} bytes but ${declared} were announced.`;
      await reportError(ctx, key, reg, message);
      return sendJson(res, 400, { error: message });
    }
    const acl: Acl = utParam(p, "x-ut-acl") === "private" ? "private" : "public-read";
    const meta: StoredFile = {
      key,
      name: utParam(p, "x-ut-file-name") ?? got.filename ?? key,
      size: got.size,
      type: utParam(p, "x-ut-file-type") || got.contentType || "application/octet-stream",
      customId: utParam(p, "x-ut-custom-id") ?? null,
      acl,
      contentDisposition: utParam(p, "x-ut-content-disposition") === "attachment" ? "attachment" : "inline",
      fileHash: got.md5,
      uploadedAt: Date.now(),
      appId: identifier,
    };
    await ctx.store.commit(temp, meta);
    const u = urls(ctx, key, identifier || ctx.appId || "app");
    const answer = { ...u, fileHash: meta.fileHash };
    if (!reg) return sendJson(res, 200, { ...answer, serverData: null });

    const payload = JSON.stringify({
      status: "uploaded",
      metadata: reg.metadata,
      origin: ctx.base,
      file: {
        name: meta.name,
        size: meta.size,
        type: meta.type,
        lastModified: meta.uploadedAt,
        customId: meta.customId,
        key,
        ...u,
        fileHash: meta.fileHash,
      },
    });
    const held = reg.awaitServerData ? ctx.state.hold(key, ctx.callbackTimeoutMs) : null;
    const r = reg;
    const delivered = deliver(ctx, r, "callback", payload).then((err) => {
      ctx.state.finish(key);
      if (err) {
        ctx.log(`upload fake: ${err}`);
        ctx.state.settle(key, { ok: false, error: err });
      } else if (!r.isDev && held) {
        // In production mode the SDK answers the callback only after onUploadComplete and its
        // /callback-result post; no result shortly after means onUploadComplete failed.
        setTimeout(
          () =>
            ctx.state.settle(key, {
              ok: false,
              error: "The app could not record the upload (onUploadComplete failed). Try again.",
            }),
          ctx.callbackGraceMs,
        ).unref();
      }
      return err;
    });
    if (!held) {
      // the app does not wait for server data: answer as soon as the file is stored
      void delivered;
      return sendJson(res, 200, { ...answer, serverData: null });
    }
    const result = await held;
    if (result.ok) return sendJson(res, 200, { ...answer, serverData: result.serverData ?? null });
    return sendJson(res, 200, { error: result.error });
  } finally {
    ctx.state.uploading.delete(key);
  }
}
