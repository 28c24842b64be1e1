/**
 * Reading the stored pool (lib/pool/stored.ts): the pool's report and its members from two
 * indexed reads, the board's figures from one; no engine state is merged on a request.
 */
import { and, eq } from "drizzle-orm";
import type { DbOrTx } from "@/db/client";
import { batches, batchVersions, decisions, organisations, poolMembers, poolStates } from "@/db/schema";
import type { ReadinessReport } from "@/lib/readiness";
import type { PoolMember } from "./pool";
import { versionColumns } from "./version-columns";

export type StoredPool = {
  planVersion: number;
  report: ReadinessReport | null;
  error: string | null;
  members: PoolMember[];
};

/** The stored pool of a study when it was stored under `planVersion`; null otherwise. */
export async function readStoredPool(
  db: DbOrTx,
  studyId: number,
  planVersion: number,
  currentPlanHash: string,
): Promise<StoredPool | null> {
  const [row] = await db
    .select({ planVersion: poolStates.planVersion, report: poolStates.report, error: poolStates.error })
    .from(poolStates)
    .where(eq(poolStates.studyId, studyId));
  if (!row || row.planVersion !== planVersion) return null;
  const rows = await db
    .select({
      ...versionColumns,
      rowsTotal: poolMembers.rowsTotal,
      rowsComplete: poolMembers.rowsComplete,
      residualDf: poolMembers.residualDf,
      decidedAt: decisions.decidedAt,
      delimiter: poolMembers.delimiter,
      decimal: poolMembers.decimalMark,
      encoding: poolMembers.encoding,
      planHash: poolMembers.planHash,
    })
    .from(poolMembers)
    .innerJoin(batchVersions, eq(batchVersions.id, poolMembers.batchVersionId))
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .leftJoin(
      decisions,
      and(eq(decisions.batchVersionId, poolMembers.batchVersionId), eq(decisions.decision, "accept")),
    )
    .where(eq(poolMembers.studyId, studyId))
    .orderBy(decisions.decidedAt, poolMembers.batchVersionId);
  return {
    planVersion: row.planVersion,
    report: (row.report as ReadinessReport | null) ?? null,
    error: row.error,
    members: rows.map(({ planHash, decimal, ...m }) => ({
      ...m,
      decimal: decimal === "." || decimal === "," ? decimal : null,
      currentPlan: planHash === currentPlanHash,
    })),
  };
}

/** The stored merged engine state of a study's pool under `planVersion` (null: none stored, or empty). */
export async function readStoredState(
  db: DbOrTx,
  studyId: number,
  planVersion: number,
): Promise<{ state: unknown; versionIds: number[] } | null> {
  const [row] = await db
    .select({
      planVersion: poolStates.planVersion,
      state: poolStates.state,
      versionIds: poolStates.versionIds,
    })
    .from(poolStates)
    .where(eq(poolStates.studyId, studyId));
  if (!row || row.planVersion !== planVersion) return null;
  return { state: row.state, versionIds: row.versionIds };
}

/** The board's figures of every stored pool, by study id. */
export async function storedFigures(db: DbOrTx) {
  const rows = await db
    .select({
      studyId: poolStates.studyId,
      planVersion: poolStates.planVersion,
      batches: poolStates.batches,
      rows: poolStates.rowsTotal,
      completeCases: poolStates.rowsComplete,
      parameters: poolStates.parameters,
      residualDf: poolStates.residualDf,
      dfTarget: poolStates.dfTarget,
      error: poolStates.error,
    })
    .from(poolStates);
  return new Map(rows.map((r) => [r.studyId, r]));
}
