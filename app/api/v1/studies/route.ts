// GET /api/v1/studies — the studies the caller may see.
import { apiRoute } from "@/lib/api/route";
import { jsonData } from "@/lib/api/respond";
import { listStudiesForUser } from "@/lib/dal/studies";

export const GET = apiRoute({ action: "study.read" }, async ({ actor }) => jsonData(await listStudiesForUser(actor)));
