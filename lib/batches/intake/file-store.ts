/**
 * Server-side access to stored uploads, shared by the app and the worker: one `UTApi`
 * configured from the environment, and a stream of a stored file's bytes by key.
 * No `server-only` import: the worker runs in plain Node.
 */
import { UTApi } from "uploadthing/server";
import { env } from "@/lib/env";

export type UploadServiceConfig = {
  /** base64 JSON {apiKey, appId, regions} */
  token: string;
  /** UTApi endpoint base (the fake in development and tests) */
  apiUrl?: string;
  /** ingest base for uploads from the server */
  ingestUrl?: string;
  /** host that serves files; derived from `ingestUrl` when it is on loopback */
  ufsHost?: string;
};

/**
 * The host the SDK should put in file URLs it signs itself (`generateSignedURL`).
 * The SDK uses http only for hosts containing "local", so loopback becomes localhost:<port>,
 * and the app id goes in the path (`/a/<appId>/<key>`), which the fake serves.
 */
export function loopbackUfsHost(ingestUrl: string | undefined): string | undefined {
  if (!ingestUrl) return undefined;
  const u = new URL(ingestUrl);
  if (u.hostname === "127.0.0.1" || u.hostname === "localhost" || u.hostname === "[::1]") {
    return `localhost${u.port ? `:${u.port}` : ""}`;
  }
  return undefined;
}

/** A UTApi for the given service settings. */
export function createUtapi(cfg: UploadServiceConfig): UTApi {
  const ufsHost = cfg.ufsHost ?? loopbackUfsHost(cfg.ingestUrl);
  return new UTApi({
    token: cfg.token,
    apiUrl: cfg.apiUrl,
    ingestUrl: cfg.ingestUrl,
    ...(ufsHost ? { ufsHost, ufsAppIdLocation: "path" as const } : {}),
    logLevel: "Error",
  });
}

let cached: UTApi | undefined;

/** The process-wide UTApi from UPLOADTHING_TOKEN, UPLOADTHING_API_URL and UPLOADTHING_INGEST_URL. */
export function utapi(): UTApi {
  if (cached) return cached;
  const e = env();
  if (!e.UPLOADTHING_TOKEN) throw new Error("UPLOADTHING_TOKEN is not set; see .env.example.");
  cached = createUtapi({
    token: e.UPLOADTHING_TOKEN,
    apiUrl: e.UPLOADTHING_API_URL,
    ingestUrl: e.UPLOADTHING_INGEST_URL,
    ufsHost: e.UPLOADTHING_UFS_HOST,
  });
  return cached;
}

/** Thrown when the upload service has no file under the key. */
export class StoredFileMissingError extends Error {
  constructor(readonly key: string) {
    super(`The upload store has no file with key ${key}.`);
    this.name = "StoredFileMissingError";
  }
}

/**
 * The bytes of a stored file as a web stream, fetched through a short-lived signed URL
 * (works for private and public files). Throws StoredFileMissingError on 404.
 */
export async function openStoredFile(
  key: string,
  opts: { api?: UTApi; signal?: AbortSignal } = {},
): Promise<ReadableStream<Uint8Array>> {
  const api = opts.api ?? utapi();
  const { ufsUrl } = await api.generateSignedURL(key, { expiresIn: 300 });
  const res = await fetch(ufsUrl, { signal: opts.signal });
  if (res.status === 404) {
    await res.body?.cancel();
    throw new StoredFileMissingError(key);
  }
  if (!res.ok || !res.body) {
    const text = await res.text().catch(() => "");
    throw new Error(`Fetching stored file ${key} failed: HTTP ${res.status} ${text.slice(0, 200)}`);
  }
  return res.body;
}
