// GET /api/v1/batches/:publicId — one batch with its versions; 404 (not 403) outside the caller's scope, so existence does not leak.
import { apiRoute } from "@/lib/http/route";
import { parseParams } from "@/lib/http/parse";
import { batchParams } from "@/lib/http/params";
import { jsonData } from "@/lib/http/respond";
import { getBatchForUser } from "@/lib/batches/queries";
import { AppError } from "@/lib/errors";

const NOT_VISIBLE = "No batch with this id is visible to you.";

export const GET = apiRoute<{ id: string }>({ action: "batch.read" }, async ({ actor, params }) => {
  const { id } = parseParams(params, batchParams);
  const batch = await getBatchForUser(actor, id);
  if (!batch) throw new AppError("not_found", NOT_VISIBLE);
  return jsonData(batch);
});
