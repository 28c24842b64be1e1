import "server-only";
/**
 * Upload through the API (scripts, with a personal API token): the same rules and the same
 * pipeline as the browser. Admission is checked before the file is stored; a file refused
 * (or not recorded) after storing is deleted again. When the file store or the database is
 * down the caller gets a 503 that says so, says nothing was recorded, and asks to try again.
 */
import pLimit from "p-limit";
import { UTFile } from "uploadthing/server";
import { getDb } from "@/db/client";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import type { SessionUser } from "@/lib/auth/session";
import { utapi } from "@/lib/batches/intake/file-store";
import { batchFileRefusal, cleanFileName } from "./file-rules";
import type { ReceivedFile } from "./multipart-upload";
import { STORE_DOWN_MESSAGE } from "./upload-errors";
import { authoriseUpload } from "../commands-upload";
import { recordStoredFile } from "./record-stored-file";
import { studyIdBySlug } from "./upload-router";
import { replayOf } from "./idempotency";

export interface ApiUploadInput {
  studySlug: string;
  batchId?: string | null;
  label?: string | null;
  /** streamed to a temporary file by receiveMultipart (multipart-upload.ts) */
  file: ReceivedFile;
  /** the request's Idempotency-Key (idempotency.ts): a retry answers the version the first attempt made */
  idempotencyKey?: string | null;
}

/**
 * At most this many API uploads are stored and recorded at once per app instance; the rest
 * wait their turn (their bytes are already on disk). A burst of uploads otherwise shares the
 * event loop with every page and API read, and the review queue slows while it lasts
 * (measured with `npm run load`: README, Performance).
 */
export const API_UPLOAD_CONCURRENCY = 4;
const uploadTurns = pLimit(API_UPLOAD_CONCURRENCY);

/** Stores and records an API upload (admission checked first), in its turn. */
export function uploadBatchViaApi(actor: SessionUser, input: ApiUploadInput) {
  return uploadTurns(() => storeAndRecord(actor, input));
}

async function storeAndRecord(actor: SessionUser, input: ApiUploadInput) {
  const db = getDb();
  // judged on the name as sent (as the browser route does), stored cleaned
  const refusal = batchFileRefusal({ name: input.file.name, size: input.file.size }, env().MAX_UPLOAD_MB);
  const name = cleanFileName(input.file.name);
  if (refusal)
    throw new AppError(refusal.code, refusal.message, { fieldErrors: { file: [refusal.message] } });
  const studyId = await studyIdBySlug(input.studySlug);
  if (studyId === null)
    throw new AppError("not_found", "This study does not exist or your organisation is not admitted to it.");
  const key = input.idempotencyKey ?? null;
  const sent = { studyId, batchPublicId: input.batchId ?? null, hash: input.file.hash };
  const earlier = key ? await replayOf(db, actor.id, key, sent) : null;
  if (earlier) return { ...earlier, replayed: true };
  const admitted = await authoriseUpload(db, actor.id, { studyId, batchPublicId: input.batchId ?? null });
  // a study or batch outside the organisation answers like a missing one (404), not 403
  if (!admitted.ok) throw new AppError(admitted.code ?? "forbidden", admitted.message);

  // a disk-backed Blob: the SDK streams it to the store without reading it into memory
  const bytes = await input.file.blob();
  const stored = await utapi()
    .uploadFiles(new UTFile([bytes], name, { type: input.file.type || "text/csv" }), {
      acl: "private",
      contentDisposition: "attachment",
    })
    .catch((error: unknown) => ({ data: null, error }));
  if (stored.error || !stored.data) {
    throw new AppError("unavailable", STORE_DOWN_MESSAGE, { cause: stored.error });
  }
  const file = {
    key: stored.data.key,
    url: stored.data.ufsUrl,
    name,
    size: input.file.size,
    hash: input.file.hash,
  };
  try {
    const done = await recordStoredFile(
      actor.id,
      { studyId, batchPublicId: input.batchId ?? null, title: input.label ?? null },
      { ...file, idempotencyKey: key },
    );
    return { batchPublicId: done.batchPublicId, version: done.version, state: "received", replayed: false };
  } catch (e) {
    // two attempts with one key at once: the other one's version stands (ours was not recorded)
    const winner = key ? await replayOf(db, actor.id, key, sent) : null;
    if (winner) return { ...winner, replayed: true };
    throw e;
  }
}
