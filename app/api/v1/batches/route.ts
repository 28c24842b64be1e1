// GET /api/v1/batches[?studyId=&state=] — the batches the caller may see, with their latest version's state.
import { z } from "zod";
import { BATCH_STATES } from "@/db/schema";
import { apiRoute } from "@/lib/api/route";
import { parseQuery } from "@/lib/api/parse";
import { jsonData } from "@/lib/api/respond";
import { listBatchesForUser } from "@/lib/dal/batches";

const querySchema = z.object({
  studyId: z.coerce.number().int().positive("studyId is a positive whole number.").optional(),
  state: z.enum(BATCH_STATES, { error: `state is one of: ${BATCH_STATES.join(", ")}.` }).optional(),
  limit: z.coerce.number().int().min(1).max(2000, "limit is at most 2000.").optional(),
});

export const GET = apiRoute({ action: "batch.read" }, async ({ req, actor }) => {
  const query = parseQuery(req, querySchema);
  return jsonData(await listBatchesForUser(actor, query));
});
