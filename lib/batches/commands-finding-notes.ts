/**
 * Notes on findings: an analyst (or a script with the analyst's token) comments on one finding of
 * a version before deciding it. The notes wait with the version; the decision takes every note on
 * it, so the provider's e-mail carries them beside the decision's own comments, and the report
 * page shows them to the analysts before anyone decides. A decided or superseded version takes no
 * new notes.
 */
import { and, eq, isNull } from "drizzle-orm";
import type { Tx } from "@/db/client";
import { findingComments } from "@/db/schema";
import { now } from "@/lib/core/clock";
import { write } from "@/lib/core/write";
import { fail, fieldErrorsOf, ok, type Result } from "@/lib/result";
import { batchForDecider, lockVersion, reportFindings } from "./decidable";
import { findingCommentInput, type FindingCommentInput } from "./schemas";
import type { FindingCommentView } from "./queries-finding-notes";

/** A note as it was made (the listing adds whether a decision has sent it). */
export type FindingNote = Omit<FindingCommentView, "sent">;

/** Adds a note on finding `code` of version `versionNo` (batch.decide: the study's analysts, admins). */
export function noteOnFinding(
  actorId: number,
  batchPublicId: string,
  versionNo: number,
  raw: FindingCommentInput,
): Promise<Result<FindingNote>> {
  return write({
    name: "noteOnFinding",
    actorId,
    may: "batch.decide",
    forbidden: "Your role does not allow commenting on findings.",
    schema: findingCommentInput,
    input: raw,
    invalid: (issues) =>
      fail(issues[0]?.message ?? "The comment is not valid.", fieldErrorsOf(issues), "invalid"),
    run: async ({ tx, actor, input, audit }) => {
      const notFound = fail<FindingNote>("No batch with this id is visible to you.", undefined, "not_found");
      const batch = await batchForDecider(tx, actor, batchPublicId);
      if (!batch) return notFound;
      const version = await lockVersion(tx, batch.id, versionNo);
      if (!version) return notFound;
      if (version.state === "accepted" || version.state === "bounced")
        return fail(
          `Version ${versionNo} is already ${version.state}; its comments went with the decision.`,
          undefined,
          "conflict",
        );
      if (version.state === "superseded" || version.version !== batch.latestVersion)
        return fail(
          `Version ${versionNo} has been superseded by version ${batch.latestVersion}; comment on the newest version.`,
          undefined,
          "conflict",
        );
      const findings = await reportFindings(tx, version.id);
      if (!findings.some((f) => f.code === input.code))
        return fail(
          findings.length
            ? `The report has no finding "${input.code}" to comment on; its findings are ${[...new Set(findings.map((f) => f.code))].join(", ")}.`
            : "This version's report has no findings yet; comment once its checks have finished.",
          { code: [`unknown finding ${input.code}`] },
        );
      const createdAt = now();
      const [ins] = await tx
        .insert(findingComments)
        .values({
          batchVersionId: version.id,
          findingCode: input.code,
          columns: input.columns.join(",").slice(0, 1000),
          comment: input.comment,
          authorId: actor.id,
          createdAt,
        })
        .$returningId();
      if (!ins) throw new Error("inserting the note returned no id");
      await audit({
        action: "batch.finding_note",
        objectType: "batch_version",
        objectId: version.id,
        studyId: batch.studyId,
        batchId: batch.id,
        after: { noteId: ins.id, code: input.code, columns: input.columns },
      });
      return ok({ id: ins.id, ...input, author: actor.name, createdAt });
    },
  });
}

/** The notes on a version not yet sent with a decision, oldest first. */
export async function pendingNotes(tx: Tx, versionId: number) {
  const rows = await tx
    .select({
      id: findingComments.id,
      code: findingComments.findingCode,
      columns: findingComments.columns,
      comment: findingComments.comment,
    })
    .from(findingComments)
    .where(and(eq(findingComments.batchVersionId, versionId), isNull(findingComments.decisionId)))
    .orderBy(findingComments.id);
  return rows.map((r) => ({ ...r, columns: r.columns ? r.columns.split(",") : [] }));
}

/** Hands the version's pending notes to the decision just made. */
export async function attachNotes(tx: Tx, versionId: number, decisionId: number): Promise<void> {
  await tx
    .update(findingComments)
    .set({ decisionId })
    .where(and(eq(findingComments.batchVersionId, versionId), isNull(findingComments.decisionId)));
}
