import "server-only";
/**
 * The last step of both upload paths (the browser's and the API's): a file already in the
 * store becomes the next batch version. When it does not (refused meanwhile, e.g. the study
 * closed, or the database is down), the stored file is deleted, so nothing is kept that no
 * version points at, and the refusal is thrown as an AppError.
 */
import { AppError } from "@/lib/errors";
import { recordBatchVersion, type StoredFile, type UploadTarget } from "../commands-upload";
import type { MachineCorrection } from "../fixes";
import { utapi } from "./file-store";
import { DB_DOWN_MESSAGE } from "./upload-errors";

export async function recordStoredFile(
  actorId: number,
  target: UploadTarget,
  file: StoredFile,
  fix?: MachineCorrection,
) {
  // recordBatchVersion cleans the file name (file-rules.ts cleanFileName)
  const recorded = await recordBatchVersion(actorId, target, file, fix);
  if (recorded.ok) return recorded.data;
  await discard(file);
  const message = recorded.code === "unavailable" ? DB_DOWN_MESSAGE : recorded.message;
  throw new AppError(recorded.code ?? "forbidden", message);
}

/** Delete a stored file no version will point at. */
export async function discard(file: StoredFile): Promise<void> {
  // the version, its job and its audit rows are one transaction: none of them was written
  await utapi()
    .deleteFiles([file.key])
    .catch((e) => console.error("could not delete an upload that was not recorded", e));
}
