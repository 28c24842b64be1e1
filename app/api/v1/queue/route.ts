// GET /api/v1/queue — the review queue: latest versions waiting on the analysts or the checks, in the caller's studies.
import { apiRoute } from "@/lib/api/route";
import { jsonData } from "@/lib/api/respond";
import { listQueueForUser } from "@/lib/dal/queue";

export const GET = apiRoute({ action: "batch.decide" }, async ({ actor }) => jsonData(await listQueueForUser(actor)));
