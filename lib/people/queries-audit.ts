import "server-only";
import { and, desc, eq, lt } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditEvents, users } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";
import { afterKey, keysetList, pageOf, rowsToRead, type Page, type PageRequest } from "@/lib/http/keyset";

export type AuditEventItem = {
  id: number;
  action: string;
  objectType: string;
  objectId: string;
  studyId: number | null;
  batchId: number | null;
  before: unknown;
  after: unknown;
  actorId: number | null;
  actorName: string | null;
  createdAt: Date;
};

export type AuditFilter = {
  objectType?: string;
  objectId?: string;
  batchId?: number;
  studyId?: number;
  /** the older cursor of earlier clients: rows with a smaller id (the `cursor` of `next` does the same) */
  beforeId?: number;
};

/** The audit trail pages newest first by its id. */
export const AUDIT_LIST = keysetList<[number]>("audit", ["int"]);

/**
 * A page of the audit trail, newest first, for roles with audit.read (leads, admins); others get
 * AppError("forbidden").
 */
export async function listAuditEvents(
  user: SessionUser,
  filter: AuditFilter & PageRequest<[number]>,
): Promise<Page<AuditEventItem, [number]>> {
  if (!can(user.role, "audit.read")) throw new AppError("forbidden");
  const rows = await getDb()
    .select({
      id: auditEvents.id,
      action: auditEvents.action,
      objectType: auditEvents.objectType,
      objectId: auditEvents.objectId,
      studyId: auditEvents.studyId,
      batchId: auditEvents.batchId,
      before: auditEvents.before,
      after: auditEvents.after,
      actorId: auditEvents.actorId,
      actorName: users.name,
      createdAt: auditEvents.createdAt,
    })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .where(
      and(
        filter.objectType !== undefined ? eq(auditEvents.objectType, filter.objectType) : undefined,
        filter.objectId !== undefined ? eq(auditEvents.objectId, filter.objectId) : undefined,
        filter.batchId !== undefined ? eq(auditEvents.batchId, filter.batchId) : undefined,
        filter.studyId !== undefined ? eq(auditEvents.studyId, filter.studyId) : undefined,
        filter.beforeId !== undefined ? lt(auditEvents.id, filter.beforeId) : undefined,
        afterKey([auditEvents.id], filter.after, "desc"),
      ),
    )
    .orderBy(desc(auditEvents.id))
    .limit(rowsToRead(filter.limit));
  return pageOf(rows, filter.limit, (e) => [e.id]);
}
