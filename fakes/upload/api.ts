/**
 * The server-side API (`UTApi`) endpoints of the upload fake. Every request is a JSON
 * POST carrying `x-uploadthing-api-key`; the caller checks the key before this runs.
 */
import { signUrl } from "./signing";
import type { FileStore, StoredFile } from "./store";

export type ApiContext = {
  store: FileStore;
  apiKey: string;
  /** base URL of the fake, e.g. http://127.0.0.1:3401 */
  base: string;
};

export type ApiResult = { status: number; json: unknown };

const bad = (message: string): ApiResult => ({ status: 400, json: { error: message } });

export function fileUrl(base: string, key: string): string {
  return `${base}/f/${key}`;
}

async function resolveKeys(
  store: FileStore,
  body: Record<string, unknown>,
): Promise<{ files: (StoredFile | null)[]; asked: string[] } | string> {
  if (Array.isArray(body.fileKeys)) {
    const keys = body.fileKeys.map(String);
    return { files: await Promise.all(keys.map((k) => store.get(k))), asked: keys };
  }
  if (Array.isArray(body.customIds)) {
    const ids = body.customIds.map(String);
    return { files: await Promise.all(ids.map((id) => store.findByCustomId(id))), asked: ids };
  }
  return "Send `fileKeys` or `customIds` as an array.";
}

async function one(store: FileStore, u: Record<string, unknown>): Promise<StoredFile | null> {
  if (typeof u.fileKey === "string") return store.get(u.fileKey);
  if (typeof u.customId === "string") return store.findByCustomId(u.customId);
  return null;
}

/** Dispatches one `/v6/*` call. Unknown paths answer 404. */
export async function handleApi(
  pathname: string,
  body: Record<string, unknown>,
  ctx: ApiContext,
): Promise<ApiResult> {
  const { store } = ctx;
  switch (pathname) {
    case "/v6/deleteFiles": {
      const r = await resolveKeys(store, body);
      if (typeof r === "string") return bad(r);
      let deletedCount = 0;
      for (const f of r.files) if (f && (await store.delete(f.key))) deletedCount++;
      return { status: 200, json: { success: true, deletedCount } };
    }
    case "/v6/getFileUrl": {
      const r = await resolveKeys(store, body);
      if (typeof r === "string") return bad(r);
      const data = r.files
        .filter((f): f is StoredFile => f !== null)
        .map((f) => ({ key: f.key, url: fileUrl(ctx.base, f.key) }));
      return { status: 200, json: { data } };
    }
    case "/v6/listFiles": {
      const limit = typeof body.limit === "number" && body.limit > 0 ? Math.floor(body.limit) : 500;
      const offset = typeof body.offset === "number" && body.offset > 0 ? Math.floor(body.offset) : 0;
      const all = await store.list();
      const files = all.slice(offset, offset + limit).map((f) => ({
        id: f.key,
        customId: f.customId,
        key: f.key,
        name: f.name,
        size: f.size,
        status: "Uploaded" as const,
        uploadedAt: f.uploadedAt,
      }));
      return { status: 200, json: { hasMore: offset + limit < all.length, files } };
    }
    case "/v6/requestFileAccess": {
      const f = await one(store, body);
      if (!f) return { status: 404, json: { error: "No such file." } };
      const ttl = typeof body.expiresIn === "number" && body.expiresIn > 0 ? body.expiresIn : 3600;
      if (ttl > 7 * 86400) return bad("expiresIn must be at most 7 days.");
      const url = signUrl(fileUrl(ctx.base, f.key), ctx.apiKey, ttl);
      return { status: 200, json: { url, ufsUrl: url } };
    }
    case "/v6/renameFiles":
    case "/v6/updateACL": {
      if (!Array.isArray(body.updates)) return bad("Send `updates` as an array.");
      for (const raw of body.updates as Record<string, unknown>[]) {
        const f = await one(store, raw ?? {});
        if (!f) return { status: 404, json: { error: "No such file." } };
        if (pathname === "/v6/renameFiles") {
          if (typeof raw.newName !== "string" || raw.newName === "")
            return bad("Each update needs a `newName`.");
          await store.writeMeta({ ...f, name: raw.newName });
        } else {
          if (raw.acl !== "public-read" && raw.acl !== "private")
            return bad("`acl` must be public-read or private.");
          await store.writeMeta({ ...f, acl: raw.acl });
        }
      }
      return { status: 200, json: { success: true } };
    }
    case "/v6/getUsageInfo": {
      const all = await store.list();
      const totalBytes = all.reduce((s, f) => s + f.size, 0);
      return {
        status: 200,
        json: {
          totalBytes,
          appTotalBytes: totalBytes,
          filesUploaded: all.length,
          limitBytes: 100 * 1024 ** 3,
        },
      };
    }
    default:
      return { status: 404, json: { error: `Unknown API path ${pathname}.` } };
  }
}
