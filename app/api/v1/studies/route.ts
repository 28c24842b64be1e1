// GET /api/v1/studies — the studies the caller may see.
import { apiRoute } from "@/lib/http/route";
import { checkedJsonBody } from "@/lib/http/parse";
import { jsonData, resultResponse } from "@/lib/http/respond";
import { createStudy } from "@/lib/studies";
import { createStudySchema } from "@/lib/studies/schemas";
import { listStudiesForUser } from "@/lib/studies/queries-detail";

export const GET = apiRoute({ action: "study.read" }, async ({ actor }) =>
  jsonData(await listStudiesForUser(actor)),
);

// POST /api/v1/studies — create a study (leads, admins): the same service as the studies page.
export const POST = apiRoute({ action: "study.manage" }, async ({ req, actor }) => {
  const input = await checkedJsonBody(req, createStudySchema);
  return resultResponse(await createStudy(actor.id, input), 201, (s) => `/api/v1/studies/${s.slug}`);
});
