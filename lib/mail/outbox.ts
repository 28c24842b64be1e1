/**
 * The e-mail outbox: messages are queued in `email_outbox` inside the transaction that
 * causes them, and a sender delivers them later with retries and back-off.
 *
 * Guarantees: a dedupe key is queued once (unique index). A row is claimed by one sender at
 * a time (SELECT … FOR UPDATE SKIP LOCKED, then status 'sending' with a lease); a claim
 * whose lease ran out (the sender died mid-send) is claimed again. Every attempt for a row
 * carries the same Message-ID, so a resend after an uncertain first attempt is the same
 * message to any receiver, not a second distinct one.
 */
import { and, eq, inArray, lte, sql } from "drizzle-orm";
import type { Transporter } from "nodemailer";
import { getDb, type Db, type DbOrTx } from "@/db/client";
import { isDuplicateKey } from "@/db/errors";
import { emailOutbox } from "@/db/schema";
import { env } from "@/lib/env";
import { transport as defaultTransport } from "./transport";
import { sleep } from "@/lib/sleep";

export type EmailInput = {
  /** what the message is about, e.g. `decision:123:provider@x.test`; queued at most once */
  dedupeKey: string;
  /** e.g. decision, invitation, password-reset */
  kind: string;
  to: string;
  subject: string;
  text: string;
  html: string;
  batchId?: number | null;
};

const EMAIL_RE = /^[^\s@<>]+@[^\s@<>]+\.[^\s@<>]+$/;

/**
 * Queues a message in the caller's transaction. Returns `queued: false` when a message
 * with the same dedupe key was queued before (nothing changes then).
 */
export async function enqueueEmail(tx: DbOrTx, input: EmailInput): Promise<{ queued: boolean }> {
  const problems: string[] = [];
  if (!input.dedupeKey || input.dedupeKey.length > 200) problems.push("dedupeKey must be 1–200 characters");
  if (!input.kind || input.kind.length > 40) problems.push("kind must be 1–40 characters");
  if (!EMAIL_RE.test(input.to) || input.to.length > 320)
    problems.push(`"${input.to}" is not an e-mail address`);
  if (!input.subject || input.subject.length > 500) problems.push("subject must be 1–500 characters");
  if (!input.text) problems.push("a plain-text body is required");
  if (problems.length) throw new Error(`Cannot queue e-mail: ${problems.join("; ")}.`);
  try {
    await tx.insert(emailOutbox).values({
      dedupeKey: input.dedupeKey,
      kind: input.kind,
      toAddress: input.to,
      subject: input.subject,
      textBody: input.text,
      htmlBody: input.html,
      batchId: input.batchId ?? null,
    });
    return { queued: true };
  } catch (e) {
    // InnoDB undoes only the failed statement; the caller's transaction goes on
    if (isDuplicateKey(e)) return { queued: false };
    throw e;
  }
}

export type DeliverOptions = {
  db?: Db;
  /** rows claimed per call (default 20) */
  limit?: number;
  transport?: Transporter;
  /** From header; default MAIL_FROM */
  from?: string;
  /** a claim older than this is taken to be dead and retried (default 5 minutes) */
  leaseMs?: number;
  /** first retry delay; doubles per attempt up to maxDelayMs (defaults 30 s and 1 h) */
  baseDelayMs?: number;
  maxDelayMs?: number;
  /** after this many attempts a row is marked failed (default 10) */
  maxAttempts?: number;
};

export type DeliverResult = { claimed: number; sent: number; retrying: number; failed: number };

/** Delay before attempt n+1 after n failed attempts: base · 2^(n−1), capped. */
export function retryDelayMs(attempts: number, baseMs: number, maxMs: number): number {
  return Math.min(maxMs, baseMs * 2 ** Math.max(0, attempts - 1));
}

/**
 * `<outbox-<id>.<created, base 36>@<domain of From>>`: the same for every attempt of a row,
 * and different for rows of another database (or after a reset) that reuse the id, since
 * some receivers drop a message whose Message-ID they have seen.
 */
export function messageIdFor(row: { id: number; createdAt: Date }, from: string): string {
  const domain = /@([^>\s]+)>?\s*$/.exec(from)?.[1] ?? "tributary.local";
  return `<outbox-${row.id}.${row.createdAt.getTime().toString(36)}@${domain}>`;
}

function isPermanent(e: unknown): boolean {
  const code = (e as { responseCode?: number }).responseCode;
  return typeof code === "number" && code >= 500 && code < 600;
}

const interval = (ms: number) =>
  sql`DATE_ADD(NOW(3), INTERVAL ${Math.max(0, Math.round(ms)) * 1000} MICROSECOND)`;

/**
 * Claims due rows (pending and due, or 'sending' with an expired lease), sends each, and
 * records the outcome: sent; pending again with exponential back-off; or failed after a
 * permanent SMTP refusal (5xx) or too many attempts.
 */
export async function deliverOutbox(opts: DeliverOptions = {}): Promise<DeliverResult> {
  const db = opts.db ?? getDb();
  const limit = opts.limit ?? 20;
  const leaseMs = opts.leaseMs ?? 5 * 60_000;
  const base = opts.baseDelayMs ?? 30_000;
  const cap = opts.maxDelayMs ?? 60 * 60_000;
  const maxAttempts = opts.maxAttempts ?? 10;
  const from = opts.from ?? env().MAIL_FROM;
  const smtp = opts.transport ?? defaultTransport();

  const claimed = await db.transaction(async (tx) => {
    const rows = await tx
      .select()
      .from(emailOutbox)
      .where(
        and(inArray(emailOutbox.status, ["pending", "sending"]), lte(emailOutbox.nextAttemptAt, sql`NOW(3)`)),
      )
      .orderBy(emailOutbox.nextAttemptAt, emailOutbox.id)
      .limit(limit)
      .for("update", { skipLocked: true });
    if (rows.length === 0) return [];
    await tx
      .update(emailOutbox)
      .set({
        status: "sending",
        attempts: sql`${emailOutbox.attempts} + 1`,
        nextAttemptAt: interval(leaseMs),
      })
      .where(
        inArray(
          emailOutbox.id,
          rows.map((r) => r.id),
        ),
      );
    return rows.map((r) => ({ ...r, attempts: r.attempts + 1 }));
  });

  const result: DeliverResult = { claimed: claimed.length, sent: 0, retrying: 0, failed: 0 };
  for (const row of claimed) {
    const messageId = messageIdFor(row, from);
    // only the holder of this claim (same attempt count, still 'sending') records the outcome
    const mine = and(
      eq(emailOutbox.id, row.id),
      eq(emailOutbox.status, "sending"),
      eq(emailOutbox.attempts, row.attempts),
    );
    try {
      await smtp.sendMail({
        from,
        to: row.toAddress,
        subject: row.subject,
        text: row.textBody,
        html: row.htmlBody || undefined,
        messageId,
        headers: { "X-Tributary-Kind": row.kind },
      });
      await db
        .update(emailOutbox)
        .set({ status: "sent", sentAt: sql`NOW(3)`, messageId, lastError: null })
        .where(mine);
      result.sent++;
    } catch (e) {
      const error = `${(e as Error).message ?? e}`.slice(0, 2000);
      const give_up = isPermanent(e) || row.attempts >= maxAttempts;
      await db
        .update(emailOutbox)
        .set(
          give_up
            ? { status: "failed", lastError: error, messageId }
            : {
                status: "pending",
                lastError: error,
                messageId,
                nextAttemptAt: interval(retryDelayMs(row.attempts, base, cap)),
              },
        )
        .where(mine);
      if (give_up) result.failed++;
      else result.retrying++;
    }
  }
  return result;
}

/**
 * The sender loop for the worker: delivers until `signal` aborts, draining a backlog at
 * once and otherwise polling every `intervalMs`. Errors (database or SMTP down) are
 * logged and retried on the next round.
 */
export async function runMailSender(opts: {
  signal: AbortSignal;
  intervalMs?: number;
  deliver?: DeliverOptions;
  log?: (msg: string) => void;
}): Promise<void> {
  const intervalMs = opts.intervalMs ?? 2_000;
  const log = opts.log ?? ((m: string) => console.error(m));
  while (!opts.signal.aborted) {
    let busy = false;
    try {
      const r = await deliverOutbox(opts.deliver);
      if (r.retrying || r.failed) log(`mail: ${r.sent} sent, ${r.retrying} to retry, ${r.failed} failed`);
      busy = r.claimed > 0 && r.sent === r.claimed;
    } catch (e) {
      log(`mail: delivery round failed: ${(e as Error).message}`);
    }
    if (busy) continue;
    await sleep(intervalMs, opts.signal);
  }
}
