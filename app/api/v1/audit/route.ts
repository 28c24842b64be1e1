// GET /api/v1/audit[?objectType=&objectId=&batchId=&studyId=&beforeId=&limit=] — the audit trail, newest first. Leads and admins.
import { z } from "zod";
import { apiRoute } from "@/lib/http/route";
import { parseQuery } from "@/lib/http/parse";
import { jsonData } from "@/lib/http/respond";
import { listAuditEvents } from "@/lib/people/queries-audit";

const id = (what: string) => z.coerce.number().int().positive(`${what} is a positive whole number.`).optional();

const querySchema = z.object({
  objectType: z.string().max(40, "objectType has at most 40 characters.").optional(),
  objectId: z.string().max(64, "objectId has at most 64 characters.").optional(),
  batchId: id("batchId"),
  studyId: id("studyId"),
  beforeId: id("beforeId"),
  limit: z.coerce.number().int().min(1, "limit is at least 1.").max(500, "limit is at most 500.").optional(),
});

export const GET = apiRoute({ action: "audit.read" }, async ({ req, actor }) => jsonData(await listAuditEvents(actor, parseQuery(req, querySchema))));
