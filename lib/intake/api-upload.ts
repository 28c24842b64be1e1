import "server-only";
/**
 * Upload through the API (scripts, with a personal API token): the same rules and the same
 * pipeline as the browser. Admission is checked before the file is stored; a file refused
 * (or not recorded) after storing is deleted again. When the file store or the database is
 * down the caller gets a 503 that says so, says nothing was recorded, and asks to try again.
 */
import { UTFile } from "uploadthing/server";
import { getDb } from "@/db/client";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import type { SessionUser } from "@/lib/auth/session";
import { isDbUnavailable } from "@/lib/jobs/db-retry";
import { utapi } from "@/lib/uploads";
import { batchFileProblem } from "./file-rules";
import { authoriseUpload, recordBatchVersion } from "./record-upload";
import { cleanFileName, studyIdBySlug } from "./upload-router";

const STORE_DOWN = "The file store could not be reached, or it broke off the upload, so the file was not stored. Nothing was recorded; try again in a moment.";
const DB_DOWN = "The database could not be reached, so the batch was not recorded (the stored file was removed again). Nothing was recorded; try again in a moment.";

export interface ApiUploadInput {
  studySlug: string;
  batchId?: string | null;
  label?: string | null;
  file: File;
}

export async function uploadBatchViaApi(actor: SessionUser, input: ApiUploadInput) {
  const db = getDb();
  const name = cleanFileName(input.file.name);
  const problem = batchFileProblem({ name, size: input.file.size }, env().MAX_UPLOAD_MB);
  if (problem) throw new AppError("invalid", problem, { fieldErrors: { file: [problem] } });
  const studyId = await studyIdBySlug(input.studySlug);
  if (studyId === null) throw new AppError("not_found", "This study does not exist or your organisation is not admitted to it.");
  const admitted = await authoriseUpload(db, actor.id, { studyId, batchPublicId: input.batchId ?? null });
  if (!admitted.ok) throw new AppError("forbidden", admitted.message);

  const bytes = new Uint8Array(await input.file.arrayBuffer());
  const hash = await crypto.subtle.digest("SHA-256", bytes);
  const stored = await utapi()
    .uploadFiles(new UTFile([bytes], name, { type: input.file.type || "text/csv" }), { acl: "private", contentDisposition: "attachment" })
    .catch((error: unknown) => ({ data: null, error }));
  if (stored.error || !stored.data) {
    throw new AppError("unavailable", STORE_DOWN, { cause: stored.error });
  }
  const key = stored.data.key;
  const forget = () => utapi().deleteFiles([key]).catch((e) => console.error("could not delete an upload that was not recorded", e));
  let recorded: Awaited<ReturnType<typeof recordBatchVersion>>;
  try {
    recorded = await recordBatchVersion(
      db,
      actor.id,
      { studyId, batchPublicId: input.batchId ?? null, title: input.label ?? null },
      { key, url: stored.data.ufsUrl, name, size: input.file.size, hash: Buffer.from(hash).toString("hex") },
    );
  } catch (error) {
    // the version, its job and its audit rows are one transaction: none of them was written
    await forget();
    if (isDbUnavailable(error)) throw new AppError("unavailable", DB_DOWN, { cause: error });
    throw error;
  }
  if (!recorded.ok) {
    await forget();
    throw new AppError("forbidden", recorded.message);
  }
  return recorded.data;
}
