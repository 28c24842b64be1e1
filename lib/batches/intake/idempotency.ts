import "server-only";
/**
 * Retry-safe API uploads: a client that sends `Idempotency-Key` (the IETF HTTPAPI working group's
 * draft "The Idempotency-Key HTTP Header Field") can send the same upload again after a timeout or
 * a dropped connection and get the version the first attempt made, never a second version. The
 * key is stored on the version it made (unique per uploader), in the transaction that records it,
 * so an attempt cut off before that commit left nothing and a retry records the file; one cut off
 * after it is answered from the stored version. A key reused for a different upload is refused.
 */
import { and, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { batches, batchVersions, studies } from "@/db/schema";
import { AppError } from "@/lib/errors";

export const IDEMPOTENCY_HEADER = "idempotency-key";
const KEY = /^[\x21-\x7e]{1,200}$/;

/** The header's key (a structured-field string, RFC 8941, or a bare token), null when absent. */
export function idempotencyKeyOf(req: Request): string | null {
  const raw = req.headers.get(IDEMPOTENCY_HEADER);
  if (raw === null) return null;
  const t = raw.trim();
  const key = t.length >= 2 && t.startsWith('"') && t.endsWith('"') ? t.slice(1, -1) : t;
  if (!KEY.test(key) || key.includes('"'))
    throw new AppError(
      "bad_request",
      'Idempotency-Key must be 1 to 200 visible ASCII characters, e.g. Idempotency-Key: "9f2c4e1a-upload-17"; send a new unique key for each upload.',
    );
  return key;
}

export type Replay = { batchPublicId: string; version: number; state: string };

/**
 * The version an earlier attempt with this key made, or null when there is none. Throws 422 when
 * the key was used for a different upload (another study, another batch, or other bytes).
 */
export async function replayOf(
  db: Db,
  uploaderId: number,
  key: string,
  sent: { studyId: number; batchPublicId: string | null; hash: string | null },
): Promise<Replay | null> {
  const [v] = await db
    .select({
      batchPublicId: batches.publicId,
      version: batchVersions.version,
      state: batchVersions.state,
      studyId: studies.id,
      hash: batchVersions.contentHash,
    })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .where(and(eq(batchVersions.uploadedById, uploaderId), eq(batchVersions.idempotencyKey, key)));
  if (!v) return null;
  const same =
    v.studyId === sent.studyId &&
    (sent.batchPublicId === null ? v.version === 1 : sent.batchPublicId === v.batchPublicId) &&
    v.hash === sent.hash;
  if (!same)
    throw new AppError(
      "invalid",
      `This Idempotency-Key was used for another upload (version ${v.version} of batch ${v.batchPublicId}); send a new key for a new upload.`,
      { fieldErrors: { "Idempotency-Key": ["used for another upload"] } },
    );
  return { batchPublicId: v.batchPublicId, version: v.version, state: v.state };
}
