/**
 * Sending the digest: one message per active lead, queued in the outbox in one transaction
 * with an audit row. The weekly send is keyed by the week, so it goes out once per lead per
 * week however often the schedule fires; "send now" is keyed by the moment it was asked for.
 */
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { write, type WriteContext } from "@/lib/core/write";
import { enqueueEmail } from "@/lib/mail";
import { fail, ok, type Result } from "@/lib/result";
import { weekStart } from "./board-stats";
import { composeDigest, digestData } from "./digest-compose";

export type DigestSent = { recipients: number; queued: number; subject: string };

type DigestRequest = { now: Date; reason: "weekly" | "now" };

async function queueDigest({
  tx,
  input,
  audit,
}: WriteContext<DigestRequest, unknown>): Promise<Result<DigestSent>> {
  const { now, reason } = input;
  const leads = await tx
    .select({ email: users.email })
    .from(users)
    .where(and(eq(users.role, "lead"), eq(users.active, true)));
  if (!leads.length) return fail("There is no active lead to send the digest to.", undefined, "conflict");
  const mail = composeDigest(await digestData(getDb(), now));
  const key =
    reason === "weekly" ? `week-${weekStart(now).toISOString().slice(0, 10)}` : `now-${now.toISOString()}`;
  let queued = 0;
  for (const l of leads) {
    const r = await enqueueEmail(tx, {
      dedupeKey: `digest:${key}:${l.email}`,
      kind: "digest",
      to: l.email,
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
    });
    if (r.queued) queued++;
  }
  if (queued > 0) {
    const after = { reason, recipients: leads.length, queued };
    await audit({ action: "digest.send", objectType: "digest", objectId: key, after });
  }
  return ok({ recipients: leads.length, queued, subject: mail.subject });
}

const digestRequest = z.object({ now: z.date(), reason: z.enum(["weekly", "now"]) });

/** Queues the digest: asked for by a lead or admin (board.read), or by the worker's schedule (no actor). */
export function sendDigest(opts: {
  actorId: number | null;
  now?: Date;
  reason: "weekly" | "now";
}): Promise<Result<DigestSent>> {
  const common = {
    name: "sendDigest",
    schema: digestRequest,
    input: { now: opts.now ?? new Date(), reason: opts.reason },
  };
  if (opts.actorId === null) return write({ ...common, actorId: null, may: "anyone", run: queueDigest });
  return write({
    ...common,
    actorId: opts.actorId,
    may: "board.read",
    forbidden: "Only leads and admins can send the digest.",
    run: queueDigest,
  });
}
