// GET /api/v1/queue — the review queue: latest versions waiting on the analysts or the checks, in the caller's studies.
import { apiRoute } from "@/lib/http/route";
import { jsonData } from "@/lib/http/respond";
import { listQueueForUser } from "@/lib/batches/queries-queue";

export const GET = apiRoute({ action: "batch.decide" }, async ({ actor }) =>
  jsonData(await listQueueForUser(actor)),
);
