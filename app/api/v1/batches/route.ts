// GET /api/v1/batches[?studyId=&state=] — the batches the caller may see, with their latest version's state.
// POST /api/v1/batches — upload a batch file (multipart: study, file, batch?, label?); the same pipeline as the browser.
import { z } from "zod";
import { BATCH_STATES } from "@/db/schema";
import { apiRoute } from "@/lib/http/route";
import { parseQuery } from "@/lib/http/parse";
import { jsonData } from "@/lib/http/respond";
import { listBatchesForUser } from "@/lib/batches/queries";
import { AppError } from "@/lib/errors";
import { fieldErrorsOf } from "@/lib/result";
import { env } from "@/lib/env";
import { uploadBatchViaApi } from "@/lib/batches/intake/api-upload";
import { receiveMultipart } from "@/lib/batches/intake/multipart-upload";

const querySchema = z.object({
  studyId: z.coerce.number().int().positive("studyId is a positive whole number.").optional(),
  state: z.enum(BATCH_STATES, { error: `state is one of: ${BATCH_STATES.join(", ")}.` }).optional(),
  limit: z.coerce.number().int().min(1).max(2000, "limit is at most 2000.").optional(),
});

export const GET = apiRoute({ action: "batch.read" }, async ({ req, actor }) => {
  const query = parseQuery(req, querySchema);
  return jsonData(await listBatchesForUser(actor, query));
});

const uploadFields = z.object({
  study: z.string().trim().min(1, "Name the study by its slug in the field 'study'."),
  batch: z.string().trim().min(1).max(32).optional(),
  label: z.string().trim().max(200, "Keep the label under 200 characters.").optional(),
});

export const POST = apiRoute({ action: "batch.upload" }, async ({ req, actor }) => {
  const type = req.headers.get("content-type") ?? "";
  if (!type.startsWith("multipart/form-data")) {
    throw new AppError("invalid", "Send the batch as multipart/form-data with the fields 'study' and 'file' (and 'batch' for a new version).");
  }
  const limit = env().MAX_UPLOAD_MB * 1024 * 1024;
  const tooLarge = `The upload is larger than the ${env().MAX_UPLOAD_MB} MB limit. Split the batch into smaller files.`;
  const length = Number(req.headers.get("content-length") ?? 0);
  if (length > limit + 64 * 1024) throw new AppError("invalid", tooLarge, { fieldErrors: { file: [tooLarge] } });
  // the file streams to a temporary file (never whole in memory) and is removed when done
  const upload = await receiveMultipart(req, limit, tooLarge);
  let done: Awaited<ReturnType<typeof uploadBatchViaApi>>;
  try {
    if (!upload.file) throw new AppError("invalid", "Attach the batch file in the field 'file'.", { fieldErrors: { file: ["Attach the batch file."] } });
    const fields = uploadFields.safeParse({
      study: upload.fields.study,
      batch: upload.fields.batch || undefined,
      label: upload.fields.label || undefined,
    });
    if (!fields.success) {
      const first = fields.error.issues[0];
      throw new AppError("invalid", first?.message ?? "The upload fields are not valid.", { fieldErrors: fieldErrorsOf(fields.error.issues) });
    }
    done = await uploadBatchViaApi(actor, { studySlug: fields.data.study, batchId: fields.data.batch, label: fields.data.label, file: upload.file });
  } finally {
    await upload.discard();
  }
  return jsonData(
    {
      batchId: done.batchPublicId,
      version: done.version,
      state: "received",
      links: {
        batch: `/api/v1/batches/${done.batchPublicId}`,
        report: `/api/v1/batches/${done.batchPublicId}/versions/${done.version}/report`,
      },
    },
    201,
  );
});
