// GET /api/v1/queue[?limit=&cursor=] — the review queue: latest versions waiting on the analysts or the checks, in the caller's studies; pages follow `next`.
import { apiRoute } from "@/lib/http/route";
import { parseQuery } from "@/lib/http/parse";
import { pageQuery } from "@/lib/http/queries";
import { decodeCursor, pageResponse } from "@/lib/http/page";
import { pageQueueForUser, QUEUE_LIST } from "@/lib/batches/queries-queue";

export const GET = apiRoute({ action: "batch.decide" }, async ({ req, actor }) => {
  const { cursor, limit } = parseQuery(req, pageQuery);
  const after = decodeCursor(QUEUE_LIST, cursor);
  return pageResponse(req, QUEUE_LIST, await pageQueueForUser(actor, { after, limit }));
});
