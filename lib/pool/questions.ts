/**
 * Reading the stored pool questions: what the worker computed, when, for which plan version
 * and accepted versions, and whether a newer computation is on its way. Pages and the API
 * read these rows; nothing here computes a figure.
 */
import { and, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { batches, batchVersions, decisions, ifAcceptedQuestions, poolQuestions } from "@/db/schema";
import type { PoolQuestions } from "@/lib/readiness";
import { pendingPoolQuestions } from "@/lib/core/pool-questions-queue";

export type StoredQuestions = {
  computedAt: Date;
  planVersion: number;
  /** the accepted batch version ids the figures cover, ascending */
  versionIds: number[];
  result: PoolQuestions | null;
  /** why the figures could not be computed, when they could not */
  error: string | null;
};

export type QuestionsView = {
  /** null: not computed yet */
  stored: StoredQuestions | null;
  /** a newer computation is queued or running */
  recomputing: boolean;
  /** the stored figures are for another plan version or other accepted versions than the pool's now */
  outOfDate: boolean;
};

/** The pool as it stands, to tell whether stored figures still describe it. */
export type PoolNow = { planVersion: number; versionIds: number[] };

/** Accepted version ids per study (or of one study), ascending: the versions the pool is made of. */
export async function acceptedVersionIds(db: Db, studyId?: number): Promise<Map<number, number[]>> {
  const rows = await db
    .select({ studyId: batches.studyId, id: batchVersions.id })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(
      decisions,
      and(eq(decisions.batchVersionId, batchVersions.id), eq(decisions.decision, "accept")),
    )
    .where(
      and(
        eq(batchVersions.state, "accepted"),
        studyId === undefined ? undefined : eq(batches.studyId, studyId),
      ),
    );
  const out = new Map<number, number[]>();
  for (const r of rows) (out.get(r.studyId) ?? out.set(r.studyId, []).get(r.studyId)!).push(r.id);
  for (const ids of out.values()) ids.sort((a, b) => a - b);
  return out;
}

/** Whether stored figures were computed for the pool as it stands. */
export function describesPool(
  stored: Pick<StoredQuestions, "planVersion" | "versionIds">,
  now: PoolNow,
): boolean {
  return stored.planVersion === now.planVersion && stored.versionIds.join() === now.versionIds.join();
}

type Row = {
  jobId: number;
  computedAt: Date;
  planVersion: number;
  versionIds: number[];
  result: unknown;
  error: string | null;
};

function stored(row: Row): StoredQuestions {
  return {
    computedAt: row.computedAt,
    planVersion: row.planVersion,
    versionIds: row.versionIds,
    result: (row.result as PoolQuestions | null) ?? null,
    error: row.error,
  };
}

const columns = (t: typeof poolQuestions | typeof ifAcceptedQuestions) => ({
  jobId: t.jobId,
  computedAt: t.computedAt,
  planVersion: t.planVersion,
  versionIds: t.versionIds,
  result: t.result,
  error: t.error,
});

/** The study's stored pool questions, with whether they are being recomputed or out of date. */
export async function getPoolQuestionsView(db: Db, studyId: number, now: PoolNow): Promise<QuestionsView> {
  const [row] = await db
    .select(columns(poolQuestions))
    .from(poolQuestions)
    .where(eq(poolQuestions.studyId, studyId));
  const recomputing = await pendingPoolQuestions(db, studyId, row?.jobId ?? 0);
  return { stored: row ? stored(row) : null, recomputing, outOfDate: row ? !describesPool(row, now) : false };
}

/** "If accepted" of one version under review as stored, with the same two flags. */
export async function getIfAcceptedView(
  db: Db,
  studyId: number,
  batchVersionId: number,
  now: PoolNow,
): Promise<QuestionsView> {
  const [row] = await db
    .select(columns(ifAcceptedQuestions))
    .from(ifAcceptedQuestions)
    .where(eq(ifAcceptedQuestions.batchVersionId, batchVersionId));
  const recomputing = await pendingPoolQuestions(db, studyId, row?.jobId ?? 0, batchVersionId);
  return { stored: row ? stored(row) : null, recomputing, outOfDate: row ? !describesPool(row, now) : false };
}
