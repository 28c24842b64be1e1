/**
 * "If accepted": the pool as it would be with a version ready for review added, and the
 * drift of that version against the pool (the engine's driftFindings), before anyone decides.
 */
import { and, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { batches, batchVersions, organisations } from "@/db/schema";
import { driftFindings, poolReport, type Finding, type ReadinessReport } from "@/lib/readiness";
import { getStudyRef, loadAccepted, loadCurrentPlan, versionColumns, withStates } from "./pool";
import { readStoredState } from "./stored-read";

export type IfAccepted = {
  batchPublicId: string;
  version: number;
  studySlug: string;
  /** the pool as it is */
  before: ReadinessReport;
  /** the pool with this version added */
  after: ReadinessReport;
  /** drift of this version against the pool as it is (empty while the pool is empty) */
  drift: Finding[];
  poolMembers: number;
};

/**
 * "If accepted" for a version ready for review: the pool's figures with it added and the
 * drift findings of it against the current pool. Null when the version is not ready for
 * review or has no stored engine state.
 */
export async function getIfAccepted(
  db: Db,
  batchPublicId: string,
  versionNo: number,
): Promise<IfAccepted | null> {
  const [v] = await db
    .select({ ...versionColumns, studyId: batches.studyId, state: batchVersions.state })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .where(and(eq(batches.publicId, batchPublicId), eq(batchVersions.version, versionNo)));
  if (!v || v.state !== "ready") return null;
  const study = await getStudyRef(db, { id: v.studyId });
  if (!study) return null;
  const { plan, version, planHash } = await loadCurrentPlan(db, study);
  const [mine] = await withStates(db, [{ ...v, decidedAt: null }], planHash);
  if (!mine) return null;
  // the stored pool's merged state when there is one for this plan; merged afresh otherwise
  const stored = await readStoredState(db, study.id, version);
  let poolStates: unknown[];
  let poolMembers: number;
  if (stored && (stored.versionIds.length === 0 || stored.state != null)) {
    poolStates = stored.versionIds.length ? [stored.state] : [];
    poolMembers = stored.versionIds.length;
  } else {
    const loaded = await loadAccepted(db, study.id, planHash);
    poolStates = loaded.map((l) => l.state);
    poolMembers = loaded.length;
  }
  const before = await poolReport(poolStates, plan);
  const after = await poolReport([...poolStates, mine.state], plan);
  const drift = before.state ? driftFindings(before.state, mine.state, plan) : [];
  return { batchPublicId, version: versionNo, studySlug: study.slug, before, after, drift, poolMembers };
}
