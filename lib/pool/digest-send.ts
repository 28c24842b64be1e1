/**
 * Sending the digest: one message per active lead, queued in the outbox in one transaction
 * with an audit row. The weekly send is keyed by the week, so it goes out once per lead per
 * week however often the schedule fires; "send now" is keyed by the moment it was asked for.
 */
import { and, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { users } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import { enqueueEmail } from "@/lib/mail/outbox";
import { fail, ok, type Result } from "@/lib/result";
import { recordAudit } from "@/lib/core/audit";
import { weekStart } from "@/lib/pool/board-stats";
import { composeDigest, digestData } from "./digest-compose";

export type DigestSent = { recipients: number; queued: number; subject: string };

export async function sendDigest(db: Db, opts: { actorId: number | null; now?: Date; reason: "weekly" | "now" }): Promise<Result<DigestSent>> {
  const now = opts.now ?? new Date();
  if (opts.actorId !== null) {
    // read the role from the database: a demotion bites at once
    const [actor] = await db.select({ role: users.role, active: users.active }).from(users).where(eq(users.id, opts.actorId));
    if (!actor || !actor.active) return fail("Your account is not active. Sign in again.", undefined, "unauthenticated");
    if (!can(actor.role, "board.read")) return fail("Only leads and admins can send the digest.", undefined, "forbidden");
  }
  const leads = await db.select({ email: users.email }).from(users).where(and(eq(users.role, "lead"), eq(users.active, true)));
  if (!leads.length) return fail("There is no active lead to send the digest to.", undefined, "conflict");
  const mail = composeDigest(await digestData(db, now));
  const key = opts.reason === "weekly" ? `week-${weekStart(now).toISOString().slice(0, 10)}` : `now-${now.toISOString()}`;
  let queued = 0;
  await db.transaction(async (tx) => {
    for (const l of leads) {
      const r = await enqueueEmail(tx, { dedupeKey: `digest:${key}:${l.email}`, kind: "digest", to: l.email, subject: mail.subject, text: mail.text, html: mail.html });
      if (r.queued) queued++;
    }
    if (queued > 0) {
      await recordAudit(tx, { actorId: opts.actorId, action: "digest.send", objectType: "digest", objectId: key, after: { reason: opts.reason, recipients: leads.length, queued } });
    }
  });
  return ok({ recipients: leads.length, queued, subject: mail.subject });
}
