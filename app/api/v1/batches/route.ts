// GET /api/v1/batches[?studyId=&state=&limit=&cursor=] — the batches the caller may see, newest first, with their latest version's state; pages follow `next`.
// POST /api/v1/batches — upload a batch file (multipart: study, file, batch?, label?); the same pipeline as the browser.
// With `Idempotency-Key`, a retry of the same upload answers the version the first attempt made.
import { apiRoute } from "@/lib/http/route";
import { parseQuery } from "@/lib/http/parse";
import { batchesQuery } from "@/lib/http/queries";
import { uploadFieldsSchema } from "@/lib/http/api-schemas";
import { jsonData } from "@/lib/http/respond";
import { BATCH_LIST, pageBatchesForUser } from "@/lib/batches/queries";
import { decodeCursor, pageResponse } from "@/lib/http/page";
import { AppError } from "@/lib/errors";
import { fieldErrorsOf } from "@/lib/result";
import { env } from "@/lib/env";
import { uploadBatchViaApi } from "@/lib/batches/intake/api-upload";
import { receiveMultipart } from "@/lib/batches/intake/multipart-upload";
import { idempotencyKeyOf } from "@/lib/batches/intake/idempotency";

export const GET = apiRoute({ action: "batch.read" }, async ({ req, actor }) => {
  const { cursor, ...query } = parseQuery(req, batchesQuery);
  const after = decodeCursor(BATCH_LIST, cursor);
  return pageResponse(req, BATCH_LIST, await pageBatchesForUser(actor, { ...query, after }));
});

export const POST = apiRoute({ action: "batch.upload" }, async ({ req, actor }) => {
  const type = req.headers.get("content-type") ?? "";
  if (!type.startsWith("multipart/form-data")) {
    throw new AppError(
      "unsupported_type",
      "Send the batch as multipart/form-data with the fields 'study' and 'file' (and 'batch' for a new version).",
    );
  }
  const limit = env().MAX_UPLOAD_MB * 1024 * 1024;
  const tooLarge = `The upload is larger than the ${env().MAX_UPLOAD_MB} MB limit. Split the batch into smaller files.`;
  const length = Number(req.headers.get("content-length") ?? 0);
  if (length > limit + 64 * 1024)
    throw new AppError("too_large", tooLarge, { fieldErrors: { file: [tooLarge] } });
  const key = idempotencyKeyOf(req);
  // the file streams to a temporary file (never whole in memory) and is removed when done
  const upload = await receiveMultipart(req, limit, tooLarge);
  let done: Awaited<ReturnType<typeof uploadBatchViaApi>>;
  try {
    if (!upload.file)
      throw new AppError("invalid", "Attach the batch file in the field 'file'.", {
        fieldErrors: { file: ["Attach the batch file."] },
      });
    const fields = uploadFieldsSchema.safeParse({
      study: upload.fields.study,
      batch: upload.fields.batch || undefined,
      label: upload.fields.label || undefined,
    });
    if (!fields.success) {
      const first = fields.error.issues[0];
      throw new AppError("invalid", first?.message ?? "The upload fields are not valid.", {
        fieldErrors: fieldErrorsOf(fields.error.issues),
      });
    }
    done = await uploadBatchViaApi(actor, {
      idempotencyKey: key,
      studySlug: fields.data.study,
      batchId: fields.data.batch,
      label: fields.data.label,
      file: upload.file,
    });
  } finally {
    await upload.discard();
  }
  const batchUrl = `/api/v1/batches/${done.batchPublicId}`;
  const answer = jsonData(
    {
      batchId: done.batchPublicId,
      version: done.version,
      state: done.state,
      links: {
        batch: batchUrl,
        report: `${batchUrl}/versions/${done.version}/report`,
      },
    },
    201,
    // the version created, addressed by its report (a version has no address of its own)
    `${batchUrl}/versions/${done.version}/report`,
  );
  // a retry with the same Idempotency-Key: the version the first attempt made
  if (done.replayed) answer.headers.set("idempotent-replayed", "true");
  return answer;
});
