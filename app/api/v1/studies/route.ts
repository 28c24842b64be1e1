// GET /api/v1/studies — the studies the caller may see.
import { apiRoute } from "@/lib/http/route";
import { jsonData } from "@/lib/http/respond";
import { listStudiesForUser } from "@/lib/studies/queries-detail";

export const GET = apiRoute({ action: "study.read" }, async ({ actor }) =>
  jsonData(await listStudiesForUser(actor)),
);
