// GET /api/v1/audit[?objectType=&objectId=&batchId=&studyId=&beforeId=&limit=] — the audit trail, newest first. Leads and admins.
import { apiRoute } from "@/lib/http/route";
import { parseQuery } from "@/lib/http/parse";
import { auditQuery } from "@/lib/http/queries";
import { jsonData } from "@/lib/http/respond";
import { listAuditEvents } from "@/lib/people/queries-audit";

export const GET = apiRoute({ action: "audit.read" }, async ({ req, actor }) =>
  jsonData(await listAuditEvents(actor, parseQuery(req, auditQuery))),
);
