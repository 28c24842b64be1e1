// GET /api/v1/batches/:publicId — one batch with its versions; 404 (not 403) outside the caller's scope, so existence does not leak.
import { z } from "zod";
import { apiRoute } from "@/lib/http/route";
import { parseParams } from "@/lib/http/parse";
import { jsonData } from "@/lib/http/respond";
import { getBatchForUser } from "@/lib/batches/queries";
import { AppError } from "@/lib/errors";

const NOT_VISIBLE = "No batch with this id is visible to you.";
const paramsSchema = z.object({ id: z.string() });

export const GET = apiRoute<{ id: string }>({ action: "batch.read" }, async ({ actor, params }) => {
  const { id } = parseParams(params, paramsSchema);
  const batch = await getBatchForUser(actor, id);
  if (!batch) throw new AppError("not_found", NOT_VISIBLE);
  return jsonData(batch);
});
