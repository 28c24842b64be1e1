import "server-only";
import { asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditEvents, emailOutbox, users } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import { getBatchForUser, type BatchDetail } from "./queries";

export type TrailEntry = {
  id: string;
  at: Date;
  who: string;
  what: string;
  detail: string;
};

const ACTIONS: Record<string, string> = {
  "batch.created": "Batch created",
  "batch.received": "Version received",
  "batch.superseded": "Version superseded",
  "batch.machine-corrected": "Machine-corrected version approved",
  "batch.checked": "Checks finished",
  "batch.recheck": "Re-check requested",
  "batch.accept": "Accepted",
  "batch.bounce": "Bounced",
};

function describe(action: string, after: unknown): string {
  const a = (after ?? {}) as Record<string, unknown>;
  switch (action) {
    case "batch.received":
      return `version ${a.version ?? "?"}: ${a.fileName ?? ""}`;
    case "batch.superseded":
      return `by version ${a.by ?? "?"}`;
    case "batch.machine-corrected":
      return `version ${a.version ?? "?"} made from version ${a.fromVersion ?? "?"} by applying ${Array.isArray(a.proposals) ? a.proposals.join(", ") : "?"} (${a.changes ?? 0} cells changed)`;
    case "batch.checked":
      return `${a.state ?? ""}: ${a.blockers ?? 0} blockers, ${a.warnings ?? 0} warnings, ${a.notes ?? 0} notes (engine ${a.engineVersion ?? "?"})`;
    case "batch.recheck":
      return `against data plan version ${a.planVersion ?? "?"}`;
    case "batch.accept":
    case "batch.bounce":
      return [
        a.comment ? `“${String(a.comment)}”` : "",
        a.findingComments ? `${a.findingComments} comment(s) on findings` : "",
      ]
        .filter(Boolean)
        .join(" · ");
    default:
      return "";
  }
}

/** Every state change, decision and e-mail of one batch, oldest first, within the user's scope (null otherwise). */
export async function getBatchTrailForUser(
  user: SessionUser,
  publicId: string,
): Promise<{ batch: BatchDetail; entries: TrailEntry[] } | null> {
  const batch = await getBatchForUser(user, publicId);
  if (!batch) return null;
  const db = getDb();
  const events = await db
    .select({
      id: auditEvents.id,
      action: auditEvents.action,
      after: auditEvents.after,
      at: auditEvents.createdAt,
      who: users.name,
    })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .where(eq(auditEvents.batchId, batch.id))
    .orderBy(asc(auditEvents.id));
  const mails = await db
    .select({
      id: emailOutbox.id,
      to: emailOutbox.toAddress,
      subject: emailOutbox.subject,
      status: emailOutbox.status,
      sentAt: emailOutbox.sentAt,
      createdAt: emailOutbox.createdAt,
      attempts: emailOutbox.attempts,
    })
    .from(emailOutbox)
    .where(eq(emailOutbox.batchId, batch.id))
    .orderBy(asc(emailOutbox.id));
  const entries: TrailEntry[] = [
    ...events.map((e) => ({
      id: `a${e.id}`,
      at: e.at,
      who: e.who ?? "Tributary (checks)",
      what: ACTIONS[e.action] ?? e.action,
      detail: describe(e.action, e.after),
    })),
    ...mails.map((m) => ({
      id: `m${m.id}`,
      at: m.sentAt ?? m.createdAt,
      who: "Tributary (e-mail)",
      what:
        m.status === "sent"
          ? "E-mail sent"
          : m.status === "failed"
            ? "E-mail failed"
            : "E-mail waiting to be sent",
      detail: `to ${m.to}: ${m.subject}${m.status !== "sent" && m.attempts ? ` (${m.attempts} attempt(s) so far)` : ""}`,
    })),
  ].sort((a, b) => a.at.getTime() - b.at.getTime() || a.id.localeCompare(b.id));
  return { batch, entries };
}
