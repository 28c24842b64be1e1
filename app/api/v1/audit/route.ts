// GET /api/v1/audit[?objectType=&objectId=&batchId=&studyId=&limit=&cursor=] — the audit trail, newest first, a page at a time (follow `next`). Leads and admins.
import { apiRoute } from "@/lib/http/route";
import { parseQuery } from "@/lib/http/parse";
import { auditQuery } from "@/lib/http/queries";
import { decodeCursor, pageResponse } from "@/lib/http/page";
import { AUDIT_LIST, listAuditEvents } from "@/lib/people/queries-audit";

export const GET = apiRoute({ action: "audit.read" }, async ({ req, actor }) => {
  const { cursor, ...filter } = parseQuery(req, auditQuery);
  const after = decodeCursor(AUDIT_LIST, cursor);
  return pageResponse(req, AUDIT_LIST, await listAuditEvents(actor, { ...filter, after }));
});
