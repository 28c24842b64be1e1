/**
 * The pool questions of a study, computed from the stored engine states (never the files) by
 * the engine's poolQuestions, and stored with the pool in one transaction. Runs in the worker.
 */
import { and, eq, lt, notInArray } from "drizzle-orm";
import type { Db } from "@/db/client";
import {
  batches,
  batchVersions,
  ifAcceptedQuestions,
  organisations,
  poolQuestions as poolQuestionsTable,
} from "@/db/schema";
import { poolQuestions, type Plan, type PoolMember, type PoolQuestions } from "@/lib/readiness";
import type { DbOrTx } from "@/db/client";
import { getStudyRef, loadAccepted, loadCurrentPlan, versionColumns, withStates } from "./pool";
import { finishPoolQuestionsJob, type PoolQuestionsJob } from "./questions-claim";

type Loaded = Awaited<ReturnType<typeof loadAccepted>>[number];

/** A stored version as the engine's pool member: one batch version, grouped by its provider. */
export function memberOf(l: Loaded): PoolMember {
  const m = l.member;
  return {
    id: String(m.batchVersionId),
    label: `${m.batchTitle}, v${m.version}`,
    group: String(m.organisationId),
    groupLabel: m.organisationName,
    state: l.state as PoolMember["state"],
  };
}

/**
 * The questions; the engine's plain message when a state does not fit the plan; or neither
 * while the pool is empty (there is nothing to ask yet).
 */
export type Outcome = { result: PoolQuestions; error: null } | { result: null; error: string | null };

function attempt(members: PoolMember[], plan: Plan, candidate?: PoolMember): Outcome {
  if (members.length === 0) return { result: null, error: null };
  try {
    // "if accepted" shows the version's poolability and influence: no selection preview, which keeps a
    // whole-study job with many versions under review quick
    return {
      result: poolQuestions(members, plan, candidate ? { candidate, selection: false } : {}),
      error: null,
    };
  } catch (e) {
    if (e instanceof RangeError) return { result: null, error: e.message };
    throw e;
  }
}

export type StudyQuestions = {
  studyId: number;
  planVersion: number;
  /** the accepted version ids the figures cover, ascending */
  versionIds: number[];
  /** the pool's own (null when the job was for one version under review) */
  pool: Outcome | null;
  /** "if accepted" per version under review */
  candidates: { batchVersionId: number; outcome: Outcome }[];
};

/** The study's versions ready for review (all, or just `only`), with their stored states. */
async function readyVersions(
  db: Db,
  studyId: number,
  planHash: string,
  only: number | null,
): Promise<Loaded[]> {
  const rows = await db
    .select(versionColumns)
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .where(
      and(
        eq(batches.studyId, studyId),
        eq(batchVersions.state, "ready"),
        only === null ? undefined : eq(batchVersions.id, only),
      ),
    );
  return withStates(
    db,
    rows.map((r) => ({ ...r, decidedAt: null })),
    planHash,
  );
}

/**
 * Computes a study's pool questions from its accepted versions' stored states under the
 * current plan: the pool's own (unless `only` names one version under review) and "if
 * accepted" for every version ready for review (or just `only`). Null when the study has no
 * plan yet.
 */
export async function computeStudyQuestions(
  db: Db,
  studyId: number,
  only: number | null = null,
): Promise<StudyQuestions | null> {
  const study = await getStudyRef(db, { id: studyId });
  if (!study || study.currentPlanVersion == null) return null;
  const { plan, version, planHash } = await loadCurrentPlan(db, study);
  const accepted = await loadAccepted(db, studyId, planHash);
  const members = accepted.map(memberOf);
  const ready = await readyVersions(db, studyId, planHash, only);
  return {
    studyId,
    planVersion: version,
    versionIds: accepted.map((l) => l.member.batchVersionId).sort((a, b) => a - b),
    pool: only === null ? attempt(members, plan) : null,
    candidates: ready.map((l) => ({
      batchVersionId: l.member.batchVersionId,
      outcome: attempt(members, plan, memberOf(l)),
    })),
  };
}

/** Whether a stored row may be replaced by this job's figures: never by an older job's. */
function newer(existing: { jobId: number } | undefined, jobId: number): boolean {
  return !existing || existing.jobId <= jobId;
}

/**
 * Stores what `computeStudyQuestions` found and marks the job done, in one transaction.
 * A whole-study job also drops the "if accepted" rows of versions no longer under review.
 * Returns false (and stores nothing) when the job is no longer this worker's.
 */
export async function storeStudyQuestions(
  db: Db,
  job: PoolQuestionsJob,
  q: StudyQuestions | null,
): Promise<boolean> {
  const computedAt = new Date();
  return db.transaction(async (tx) => {
    if (!(await finishPoolQuestionsJob(tx, job))) return false;
    if (!q) return true;
    const common = {
      studyId: q.studyId,
      planVersion: q.planVersion,
      versionIds: q.versionIds,
      jobId: job.jobId,
      computedAt,
    };
    if (q.pool) {
      const [existing] = await tx
        .select({ jobId: poolQuestionsTable.jobId })
        .from(poolQuestionsTable)
        .where(eq(poolQuestionsTable.studyId, q.studyId))
        .for("update");
      if (newer(existing, job.jobId)) {
        const row = { ...common, result: q.pool.result, error: q.pool.error };
        await tx.insert(poolQuestionsTable).values(row).onDuplicateKeyUpdate({ set: row });
      }
    }
    for (const c of q.candidates)
      await storeCandidate(tx, c.batchVersionId, {
        ...common,
        result: c.outcome.result,
        error: c.outcome.error,
      });
    if (job.candidateVersionId === null) {
      const kept = q.candidates.map((c) => c.batchVersionId);
      await tx
        .delete(ifAcceptedQuestions)
        .where(
          and(
            eq(ifAcceptedQuestions.studyId, q.studyId),
            lt(ifAcceptedQuestions.jobId, job.jobId),
            kept.length ? notInArray(ifAcceptedQuestions.batchVersionId, kept) : undefined,
          ),
        );
    }
    return true;
  });
}

type CandidateRow = Omit<typeof ifAcceptedQuestions.$inferInsert, "batchVersionId" | "id">;

async function storeCandidate(tx: DbOrTx, batchVersionId: number, row: CandidateRow): Promise<void> {
  const [existing] = await tx
    .select({ jobId: ifAcceptedQuestions.jobId })
    .from(ifAcceptedQuestions)
    .where(eq(ifAcceptedQuestions.batchVersionId, batchVersionId))
    .for("update");
  if (!newer(existing, row.jobId)) return;
  await tx
    .insert(ifAcceptedQuestions)
    .values({ ...row, batchVersionId })
    .onDuplicateKeyUpdate({ set: row });
}
