import "server-only";
/**
 * Upload through the API (scripts, with a personal API token): the same rules and the same
 * pipeline as the browser. Admission is checked before the file is stored; a file refused
 * after storing is deleted again.
 */
import { UTFile } from "uploadthing/server";
import { getDb } from "@/db/client";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import type { SessionUser } from "@/lib/auth/session";
import { utapi } from "@/lib/uploads";
import { batchFileProblem } from "./file-rules";
import { authoriseUpload, recordBatchVersion } from "./record-upload";
import { cleanFileName, studyIdBySlug } from "./upload-router";

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
  const stored = await utapi().uploadFiles(new UTFile([bytes], name, { type: input.file.type || "text/csv" }), { acl: "private", contentDisposition: "attachment" });
  if (stored.error || !stored.data) {
    throw new AppError("unavailable", "The file store did not take the file. Nothing was recorded; try again in a moment.", { cause: stored.error });
  }
  const recorded = await recordBatchVersion(
    db,
    actor.id,
    { studyId, batchPublicId: input.batchId ?? null, title: input.label ?? null },
    { key: stored.data.key, url: stored.data.ufsUrl, name, size: input.file.size, hash: Buffer.from(hash).toString("hex") },
  );
  if (!recorded.ok) {
    await utapi().deleteFiles([stored.data.key]).catch((e) => console.error("could not delete a refused upload", e));
    throw new AppError("forbidden", recorded.message);
  }
  return recorded.data;
}
