import "server-only";
import { and, desc, eq, lt } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditEvents, users } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";
import { AppError } from "@/lib/errors";

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
  beforeId?: number;
  limit?: number;
};

/**
 * The audit trail, newest first, for roles with audit.read (leads, admins); others get
 * AppError("forbidden"). Page with `beforeId` (the last id of the previous page).
 */
export async function listAuditEvents(
  user: SessionUser,
  filter: AuditFilter = {},
): Promise<AuditEventItem[]> {
  if (!can(user.role, "audit.read")) throw new AppError("forbidden");
  return getDb()
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
      ),
    )
    .orderBy(desc(auditEvents.id))
    .limit(Math.min(Math.max(filter.limit ?? 100, 1), 500));
}
