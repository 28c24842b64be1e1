/**
 * HMAC-SHA256 signatures in the form the upload SDK uses: lowercase hex,
 * prefixed `hmac-sha256=`, keyed with the api key (fakes/UPLOADS.md "Trust").
 */
import { createHmac, timingSafeEqual } from "node:crypto";

const PREFIX = "hmac-sha256=";

/** `hmac-sha256=<hex>` of `payload` keyed with `apiKey`. */
export function sign(payload: string, apiKey: string): string {
  return PREFIX + createHmac("sha256", apiKey).update(payload, "utf8").digest("hex");
}

/** Constant-time check of a `hmac-sha256=` signature over `payload`. */
export function verify(payload: string, signature: string | null | undefined, apiKey: string): boolean {
  if (!signature || !signature.startsWith(PREFIX)) return false;
  const given = Buffer.from(signature.slice(PREFIX.length), "hex");
  const wanted = createHmac("sha256", apiKey).update(payload, "utf8").digest();
  return given.length === wanted.length && timingSafeEqual(given, wanted);
}

export type SignedUrlCheck =
  { ok: true; params: URLSearchParams } | { ok: false; status: 403; message: string };

/**
 * Checks a URL signed the SDK's way: the signature covers the full URL text up to
 * `&signature=`, and an `expires` parameter (ms since epoch) must lie in the future.
 * `fullUrl` is the URL as the client addressed it (scheme, Host header, raw path+query).
 */
export function checkSignedUrl(fullUrl: string, apiKey: string, now = Date.now()): SignedUrlCheck {
  const at = fullUrl.lastIndexOf("&signature=");
  if (at < 0) return { ok: false, status: 403, message: "The URL carries no signature." };
  const signed = fullUrl.slice(0, at);
  const signature = decodeURIComponent(fullUrl.slice(at + "&signature=".length).split("&")[0] ?? "");
  if (!verify(signed, signature, apiKey)) return { ok: false, status: 403, message: "Invalid signature." };
  const params = new URL(fullUrl).searchParams;
  const expires = Number(params.get("expires"));
  if (!Number.isFinite(expires) || expires <= 0)
    return { ok: false, status: 403, message: "The URL carries no expiry." };
  if (expires < now) return { ok: false, status: 403, message: "The signed URL has expired." };
  return { ok: true, params };
}

/** Builds a signed URL the same way the SDK does (`expires`, then `signature`). */
export function signUrl(url: string, apiKey: string, ttlSeconds: number, now = Date.now()): string {
  const u = new URL(url);
  u.searchParams.append("expires", String(now + ttlSeconds * 1000));
  const signature = sign(u.toString(), apiKey);
  u.searchParams.append("signature", signature);
  return u.href;
}

/**
 * Reads an `x-ut-*` value from the signed query. The SDK URI-encodes each value
 * before URLSearchParams encodes it again, so one extra decode is needed.
 */
export function utParam(params: URLSearchParams, name: string): string | undefined {
  const v = params.get(name);
  if (v == null) return undefined;
  try {
    return decodeURIComponent(v);
  } catch {
    return v;
  }
}
