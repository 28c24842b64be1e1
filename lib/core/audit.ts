/** Audit rows; no `server-only` here: the worker (plain Node) writes audit rows too. */
import type { DbOrTx } from "@/db/client";
import { auditEvents } from "@/db/schema";

export type AuditEntry = {
  actorId: number | null;
  /** what happened, dotted: "user.create", "user.role_change", "batch.accept" … */
  action: string;
  objectType: string;
  objectId: string | number;
  studyId?: number | null;
  batchId?: number | null;
  before?: unknown;
  after?: unknown;
};

/**
 * Writes one audit row. Call it inside the transaction that makes the change, so there is
 * never a decision without its audit row (nor an audit row for a change that rolled back).
 * Never put secrets (password hashes, tokens) in before/after.
 */
export async function recordAudit(tx: DbOrTx, entry: AuditEntry): Promise<void> {
  await tx.insert(auditEvents).values({
    actorId: entry.actorId,
    action: entry.action,
    objectType: entry.objectType,
    objectId: String(entry.objectId),
    studyId: entry.studyId ?? null,
    batchId: entry.batchId ?? null,
    before: entry.before ?? null,
    after: entry.after ?? null,
  });
}
