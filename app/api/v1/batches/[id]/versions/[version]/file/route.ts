// GET /api/v1/batches/:publicId/versions/:n/file — the original file as uploaded, streamed after the same scope check as the report; 404 outside it.
import { apiRoute } from "@/lib/http/route";
import { parseParams } from "@/lib/http/parse";
import { batchVersionParams } from "@/lib/http/params";
import { requireVersionFileForUser } from "@/lib/batches/queries-reports";
import { AppError } from "@/lib/errors";
import { attachmentDisposition } from "@/lib/batches/intake/file-rules";
import { openStoredFile, StoredFileMissingError } from "@/lib/batches/intake/file-store";

const TYPES: Record<string, string> = {
  csv: "text/csv",
  tsv: "text/tab-separated-values",
  txt: "text/plain",
};

export const GET = apiRoute<{ id: string; version: string }>(
  { action: "batch.read" },
  async ({ actor, params }) => {
    const { id, version } = parseParams(params, batchVersionParams);
    const { found, fileKey } = await requireVersionFileForUser(actor, id, version);
    let body: ReadableStream<Uint8Array>;
    try {
      body = await openStoredFile(fileKey);
    } catch (e) {
      if (e instanceof StoredFileMissingError)
        throw new AppError("not_found", "The file of this version is no longer in the file store.");
      throw new AppError("unavailable", "The file store did not answer. Try again in a moment.", {
        cause: e,
      });
    }
    const ext = /\.([a-z]+)$/i.exec(found.version.fileName)?.[1]?.toLowerCase() ?? "";
    return new Response(body, {
      headers: {
        "content-type": TYPES[ext] ?? "application/octet-stream",
        "content-disposition": attachmentDisposition(found.version.fileName),
        "cache-control": "private, no-store",
        "x-content-type-options": "nosniff",
      },
    });
  },
);
