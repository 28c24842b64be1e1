/**
 * Accept or bounce a batch version: one transaction that checks the current state, records
 * the decision with its comments, moves the state, writes the audit row and queues the
 * e-mails to the provider organisation. Of two analysts deciding at once, exactly one wins;
 * the other is told who decided first.
 */
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import type { Db } from "@/db/client";
import { isDuplicateKey } from "@/db/errors";
import { batches, batchVersions, decisions, findingComments, organisations, reports, studies, studyAnalysts, users } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import { env } from "@/lib/env";
import { enqueueEmail } from "@/lib/mail/outbox";
import { fail, ok, type Result } from "@/lib/result";
import { recordAudit } from "@/lib/core/audit";
import type { ReadinessReport } from "@/lib/readiness/report";
import { decisionEmail } from "./decision-email";

export const decisionInput = z.object({
  decision: z.enum(["accept", "bounce"], { error: "Choose accept or bounce." }),
  comment: z.string().trim().max(5000, "Keep the comment under 5,000 characters.").default(""),
  findingComments: z
    .array(
      z.object({
        code: z.string().min(1).max(80),
        columns: z.array(z.string().max(200)).max(50).default([]),
        comment: z.string().trim().min(1, "A finding comment cannot be empty.").max(2000, "Keep each finding comment under 2,000 characters."),
      }),
    )
    .max(200)
    .default([]),
}).superRefine((v, ctx) => {
  if (v.decision === "bounce" && !v.comment && v.findingComments.length === 0) {
    ctx.addIssue({ code: "custom", path: ["comment"], message: "Say what the provider must fix: add a comment, overall or on a finding." });
  }
});
export type DecisionInput = z.input<typeof decisionInput>;

export type DecisionDone = { decisionId: number; state: "accepted" | "bounced"; emailsQueued: number };

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

export async function decideVersion(db: Db, actorId: number, batchPublicId: string, versionNo: number, raw: DecisionInput): Promise<Result<DecisionDone>> {
  const parsed = decisionInput.safeParse(raw);
  if (!parsed.success) {
    const fieldErrors: Record<string, string[]> = {};
    for (const i of parsed.error.issues) (fieldErrors[String(i.path[0] ?? "_form")] ??= []).push(i.message);
    return fail(parsed.error.issues[0]?.message ?? "The decision is not valid.", fieldErrors);
  }
  const input = parsed.data;
  try {
    return await db.transaction(async (tx) => decideInTx(tx, actorId, batchPublicId, versionNo, input));
  } catch (e) {
    if (isDuplicateKey(e)) return await alreadyDecided(db, batchPublicId, versionNo);
    throw e;
  }
}

async function decideInTx(tx: Tx, actorId: number, batchPublicId: string, versionNo: number, input: z.output<typeof decisionInput>): Promise<Result<DecisionDone>> {
  const [actor] = await tx.select({ id: users.id, role: users.role, active: users.active, name: users.name }).from(users).where(eq(users.id, actorId));
  if (!actor || !actor.active) return fail("Your account is not active. Sign in again.", undefined, "unauthenticated");
  if (!can(actor.role, "batch.decide")) return fail("Your role does not allow accepting or bouncing batches.", undefined, "forbidden");

  const [batch] = await tx
    .select({ id: batches.id, publicId: batches.publicId, title: batches.title, latestVersion: batches.latestVersion, studyId: batches.studyId, studyTitle: studies.title, organisationId: batches.organisationId, organisationName: organisations.name })
    .from(batches)
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .where(eq(batches.publicId, batchPublicId));
  const notFound = fail<DecisionDone>("No batch with this id is visible to you.", undefined, "not_found");
  if (!batch) return notFound;
  if (actor.role === "analyst") {
    const [assigned] = await tx.select({ s: studyAnalysts.studyId }).from(studyAnalysts).where(and(eq(studyAnalysts.studyId, batch.studyId), eq(studyAnalysts.userId, actor.id)));
    if (!assigned) return notFound;
  }

  // lock the version: a second decider waits here, then sees the first one's decision
  const [version] = await tx
    .select({ id: batchVersions.id, state: batchVersions.state, version: batchVersions.version })
    .from(batchVersions)
    .where(and(eq(batchVersions.batchId, batch.id), eq(batchVersions.version, versionNo)))
    .for("update");
  if (!version) return notFound;
  if (version.state === "accepted" || version.state === "bounced") return describeDecided(tx, version.id, version.state);
  if (version.state === "superseded" || version.version !== batch.latestVersion) {
    return fail(`Version ${versionNo} has been superseded by version ${batch.latestVersion}; decide on the newest version.`, undefined, "conflict");
  }
  const decidable = version.state === "ready" || (version.state === "unreadable" && input.decision === "bounce");
  if (!decidable) {
    return fail(
      version.state === "unreadable"
        ? "An unreadable file cannot be accepted; bounce it with a comment instead."
        : "The checks on this version have not finished; decide once its report is ready.",
      undefined,
      "conflict",
    );
  }

  const [report] = await tx.select({ report: reports.report }).from(reports).where(eq(reports.batchVersionId, version.id)).limit(1);
  const findings = ((report?.report as ReadinessReport | undefined)?.findings ?? []);
  for (const fc of input.findingComments) {
    if (!findings.some((f) => f.code === fc.code)) return fail(`The report has no finding "${fc.code}" to comment on.`, { findingComments: [`unknown finding ${fc.code}`] });
  }

  const state = input.decision === "accept" ? "accepted" : "bounced";
  const [ins] = await tx
    .insert(decisions)
    .values({ batchVersionId: version.id, decision: input.decision, comment: input.comment || null, decidedById: actor.id })
    .$returningId();
  if (!ins) throw new Error("inserting the decision returned no id");
  if (input.findingComments.length) {
    await tx.insert(findingComments).values(
      input.findingComments.map((fc) => ({ decisionId: ins.id, batchVersionId: version.id, findingCode: fc.code, columns: fc.columns.join(",").slice(0, 1000), comment: fc.comment, authorId: actor.id })),
    );
  }
  await tx.update(batchVersions).set({ state, stateChangedAt: new Date() }).where(eq(batchVersions.id, version.id));
  await recordAudit(tx, {
    actorId: actor.id,
    action: `batch.${input.decision}`,
    objectType: "batch_version",
    objectId: version.id,
    studyId: batch.studyId,
    batchId: batch.id,
    before: { state: version.state },
    after: { state, decisionId: ins.id, comment: input.comment || null, findingComments: input.findingComments.length },
  });

  const recipients = await tx
    .select({ email: users.email, name: users.name })
    .from(users)
    .where(and(eq(users.organisationId, batch.organisationId), eq(users.role, "provider"), eq(users.active, true)));
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
      findingComments: input.findingComments.map((fc) => ({ ...fc, message: findings.find((f) => f.code === fc.code && sameColumns(f.columns, fc.columns))?.message ?? findings.find((f) => f.code === fc.code)?.message ?? "" })),
      link,
    });
    const q = await enqueueEmail(tx, { dedupeKey: `decision:${ins.id}:${r.email}`, kind: "decision", to: r.email, subject: mail.subject, text: mail.text, html: mail.html, batchId: batch.id });
    if (q.queued) queued++;
  }
  return ok({ decisionId: ins.id, state, emailsQueued: queued });
}

function sameColumns(a: string[], b: string[]): boolean {
  return a.length === b.length && a.every((c) => b.includes(c));
}

async function describeDecided(tx: Tx | Db, versionId: number, state: string): Promise<Result<DecisionDone>> {
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

async function alreadyDecided(db: Db, batchPublicId: string, versionNo: number): Promise<Result<DecisionDone>> {
  const [v] = await db
    .select({ id: batchVersions.id, state: batchVersions.state })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .where(and(eq(batches.publicId, batchPublicId), eq(batchVersions.version, versionNo)));
  return v ? describeDecided(db, v.id, v.state) : fail("This version was decided by someone else a moment ago. Reload to see the decision.", undefined, "conflict");
}
