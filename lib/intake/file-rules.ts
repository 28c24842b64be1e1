/**
 * What a batch file must be before it is stored, said the same way in the browser and on
 * the server: not empty, a CSV/TSV/text file, within the size limit.
 */
export const BATCH_FILE_EXTENSIONS = /\.(csv|tsv|txt)$/i;

import { formatBytes } from "@/lib/format";

/** A plain message saying what to fix, or null when the file may be uploaded. */
export function batchFileProblem(file: { name: string; size: number }, maxUploadMb: number): string | null {
  if (file.size === 0) return `"${file.name}" is empty (0 bytes). Choose the file that holds the batch.`;
  if (file.size > maxUploadMb * 1024 * 1024) {
    return `"${file.name}" is ${formatBytes(file.size)}; the limit is ${maxUploadMb} MB. Split the batch into smaller files.`;
  }
  if (!BATCH_FILE_EXTENSIONS.test(file.name)) {
    return `"${file.name}" is not a CSV file. Export the data as CSV (comma, semicolon or tab separated) and send that file.`;
  }
  return null;
}
