/**
 * The batch and version an analyst acts on, read inside the acting transaction: the batch within
 * the analyst's studies (admins see every one), and its version locked, so a decision and a note
 * on a finding see the version's state as it is, never as it was a moment ago.
 */
import { and, eq } from "drizzle-orm";
import type { Tx } from "@/db/client";
import { batches, batchVersions, organisations, reports, studies, studyAnalysts } from "@/db/schema";
import type { Actor } from "@/lib/core/actor";
import type { ReadinessReport } from "@/lib/readiness";

/** The batch with this public id if the actor decides on its study; null otherwise (answer 404). */
export async function batchForDecider(tx: Tx, actor: Actor, batchPublicId: string) {
  const [batch] = await tx
    .select({
      id: batches.id,
      publicId: batches.publicId,
      title: batches.title,
      latestVersion: batches.latestVersion,
      studyId: batches.studyId,
      studyTitle: studies.title,
      organisationId: batches.organisationId,
      organisationName: organisations.name,
    })
    .from(batches)
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .where(eq(batches.publicId, batchPublicId));
  if (!batch) return null;
  if (actor.role === "analyst") {
    const [assigned] = await tx
      .select({ s: studyAnalysts.studyId })
      .from(studyAnalysts)
      .where(and(eq(studyAnalysts.studyId, batch.studyId), eq(studyAnalysts.userId, actor.id)));
    if (!assigned) return null;
  }
  return batch;
}

/** Version `versionNo` of the batch, locked for the rest of the transaction; null when there is none. */
export async function lockVersion(tx: Tx, batchId: number, versionNo: number) {
  // a second decider waits here, then sees the first one's decision
  const [version] = await tx
    .select({ id: batchVersions.id, state: batchVersions.state, version: batchVersions.version })
    .from(batchVersions)
    .where(and(eq(batchVersions.batchId, batchId), eq(batchVersions.version, versionNo)))
    .for("update");
  return version ?? null;
}

/** The findings of the version's stored report (none while its check has not finished). */
export async function reportFindings(tx: Tx, versionId: number): Promise<ReadinessReport["findings"]> {
  const [report] = await tx
    .select({ report: reports.report })
    .from(reports)
    .where(eq(reports.batchVersionId, versionId))
    .limit(1);
  return (report?.report as ReadinessReport | undefined)?.findings ?? [];
}

export type DecidableBatch = NonNullable<Awaited<ReturnType<typeof batchForDecider>>>;
