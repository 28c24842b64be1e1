/**
 * Accept or bounce a batch version: one transaction that checks the current state, records
 * the decision with its comments, moves the state, writes the audit row and queues the
 * e-mails to the provider organisation. Of two analysts deciding at once, exactly one wins;
 * the other is told who decided first.
 */
import { and, eq } from "drizzle-orm";
import type { z } from "zod";
import { getDb, type DbOrTx, type Tx } from "@/db/client";
import { batches, batchVersions, decisions, findingComments, users } from "@/db/schema";
import type { Actor } from "@/lib/core/actor";
import { write, type Audit } from "@/lib/core/write";
import { env } from "@/lib/env";
import { enqueueEmail } from "@/lib/mail";
import { addToStoredPool } from "@/lib/pool";
import { fail, fieldErrorsOf, ok, type Result } from "@/lib/result";
import { enqueuePoolQuestions } from "@/lib/core/pool-questions-queue";
import { decisionEmail } from "./decision-email";
import { batchForDecider, lockVersion, reportFindings } from "./decidable";
import { BOUNCE_NEEDS_COMMENT, decisionInput } from "./schemas";
import { attachNotes, pendingNotes } from "./commands-finding-notes";

export type { DecisionInput } from "./schemas";
import type { DecisionInput } from "./schemas";
import { now } from "@/lib/core/clock";

export type DecisionDone = { decisionId: number; state: "accepted" | "bounced"; emailsQueued: number };

/**
 * Accepts or bounces version `versionNo` of a batch (batch.decide: analysts on their assigned
 * studies, admins). Everything happens in one transaction; of two deciders the second is told
 * who decided first.
 */
export function decideVersion(
  actorId: number,
  batchPublicId: string,
  versionNo: number,
  raw: DecisionInput,
): Promise<Result<DecisionDone>> {
  return write({
    name: "decideVersion",
    actorId,
    may: "batch.decide",
    forbidden: "Your role does not allow accepting or bouncing batches.",
    schema: decisionInput,
    input: raw,
    invalid: (issues) => fail(issues[0]?.message ?? "The decision is not valid.", fieldErrorsOf(issues)),
    // the unique key on decisions: someone decided between our read and our insert
    onDuplicate: () => alreadyDecided(getDb(), batchPublicId, versionNo),
    run: ({ tx, actor, input, audit }) => decideInTx(tx, actor, audit, batchPublicId, versionNo, input),
  });
}

async function decideInTx(
  tx: Tx,
  actor: Actor,
  audit: Audit,
  batchPublicId: string,
  versionNo: number,
  input: z.output<typeof decisionInput>,
): Promise<Result<DecisionDone>> {
  const notFound = fail<DecisionDone>("No batch with this id is visible to you.", undefined, "not_found");
  const batch = await batchForDecider(tx, actor, batchPublicId);
  if (!batch) return notFound;
  const version = await lockVersion(tx, batch.id, versionNo);
  if (!version) return notFound;
  if (version.state === "accepted" || version.state === "bounced")
    return describeDecided(tx, version.id, version.state);
  if (version.state === "superseded" || version.version !== batch.latestVersion) {
    return fail(
      `Version ${versionNo} has been superseded by version ${batch.latestVersion}; decide on the newest version.`,
      undefined,
      "conflict",
    );
  }
  const decidable =
    version.state === "ready" || (version.state === "unreadable" && input.decision === "bounce");
  if (!decidable) {
    return fail(
      version.state === "unreadable"
        ? "An unreadable file cannot be accepted; bounce it with a comment instead."
        : "The checks on this version have not finished; decide once its report is ready.",
      undefined,
      "conflict",
    );
  }

  const findings = await reportFindings(tx, version.id);
  for (const fc of input.findingComments) {
    if (!findings.some((f) => f.code === fc.code))
      return fail(`The report has no finding "${fc.code}" to comment on.`, {
        findingComments: [`unknown finding ${fc.code}`],
      });
  }

  // notes made on findings before the decision go with it, first, as they were written
  const notes = await pendingNotes(tx, version.id);
  if (input.decision === "bounce" && !input.comment && !input.findingComments.length && !notes.length)
    return fail(BOUNCE_NEEDS_COMMENT, { comment: [BOUNCE_NEEDS_COMMENT] });
  const sent = [
    ...notes.map(({ code, columns, comment }) => ({ code, columns, comment })),
    ...input.findingComments,
  ];

  const state = input.decision === "accept" ? "accepted" : "bounced";
  const [ins] = await tx
    .insert(decisions)
    .values({
      batchVersionId: version.id,
      decision: input.decision,
      comment: input.comment || null,
      decidedById: actor.id,
    })
    .$returningId();
  if (!ins) throw new Error("inserting the decision returned no id");
  await attachNotes(tx, version.id, ins.id);
  if (input.findingComments.length) {
    await tx.insert(findingComments).values(
      input.findingComments.map((fc) => ({
        decisionId: ins.id,
        batchVersionId: version.id,
        findingCode: fc.code,
        columns: fc.columns.join(",").slice(0, 1000),
        comment: fc.comment,
        authorId: actor.id,
      })),
    );
  }
  await tx
    .update(batchVersions)
    .set({ state, stateChangedAt: now() })
    .where(eq(batchVersions.id, version.id));
  if (state === "accepted") {
    // the stored pool takes the version in this same transaction: the pages never merge on a request
    await addToStoredPool(tx, batch.studyId, version.id);
    await enqueuePoolQuestions(tx, batch.studyId);
  }
  await audit({
    action: `batch.${input.decision}`,
    objectType: "batch_version",
    objectId: version.id,
    studyId: batch.studyId,
    batchId: batch.id,
    before: { state: version.state },
    after: {
      state,
      decisionId: ins.id,
      comment: input.comment || null,
      findingComments: sent.length,
    },
  });

  const recipients = await tx
    .select({ email: users.email, name: users.name })
    .from(users)
    .where(
      and(eq(users.organisationId, batch.organisationId), eq(users.role, "provider"), eq(users.active, true)),
    );
  const link = `${env().APP_URL.replace(/\/$/, "")}/batches/${batch.publicId}?v=${version.version}`;
  let queued = 0;
  for (const r of recipients) {
    const mail = decisionEmail({
      decision: input.decision,
      recipientName: r.name,
      studyTitle: batch.studyTitle,
      batchTitle: batch.title,
      organisationName: batch.organisationName,
      version: version.version,
      decidedBy: actor.name,
      comment: input.comment,
      findingComments: sent.map((fc) => ({
        ...fc,
        message:
          findings.find((f) => f.code === fc.code && sameColumns(f.columns, fc.columns))?.message ??
          findings.find((f) => f.code === fc.code)?.message ??
          "",
      })),
      link,
    });
    const q = await enqueueEmail(tx, {
      dedupeKey: `decision:${ins.id}:${r.email}`,
      kind: "decision",
      to: r.email,
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
      batchId: batch.id,
    });
    if (q.queued) queued++;
  }
  return ok({ decisionId: ins.id, state, emailsQueued: queued });
}

function sameColumns(a: string[], b: string[]): boolean {
  return a.length === b.length && a.every((c) => b.includes(c));
}

async function describeDecided(tx: DbOrTx, versionId: number, state: string): Promise<Result<DecisionDone>> {
  const [d] = await tx
    .select({ name: users.name, at: decisions.decidedAt })
    .from(decisions)
    .innerJoin(users, eq(users.id, decisions.decidedById))
    .where(eq(decisions.batchVersionId, versionId))
    // a locking read (MariaDB has no FOR SHARE) sees the other decider's committed row, which this transaction's snapshot does not
    .for("update");
  const who = d ? ` by ${d.name} at ${d.at.toISOString().slice(0, 16).replace("T", " ")} UTC` : "";
  return fail(`This version was already ${state}${who}. Reload to see the decision.`, undefined, "conflict");
}

async function alreadyDecided(
  db: DbOrTx,
  batchPublicId: string,
  versionNo: number,
): Promise<Result<DecisionDone>> {
  const [v] = await db
    .select({ id: batchVersions.id, state: batchVersions.state })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .where(and(eq(batches.publicId, batchPublicId), eq(batchVersions.version, versionNo)));
  return v
    ? describeDecided(db, v.id, v.state)
    : fail(
        "This version was decided by someone else a moment ago. Reload to see the decision.",
        undefined,
        "conflict",
      );
}
