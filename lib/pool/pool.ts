/**
 * The pool of a study: the accepted batch versions combined. Figures come from the engine
 * states stored beside each accepted version's newest report, merged by the engine's
 * poolReport; no file is read again. Superseded, bounced and undecided versions never enter.
 */
import { and, desc, eq, inArray } from "drizzle-orm";
import type { Db } from "@/db/client";
import { batches, batchVersions, dataPlans, decisions, organisations, reports, studies } from "@/db/schema";
import { isEngineState, parsePlan, poolReport, type Plan, type ReadinessReport } from "@/lib/readiness";
import { readStoredPool } from "./stored-read";
import { versionColumns, type VersionRow } from "./version-columns";

export { versionColumns } from "./version-columns";

// "if accepted" lives in its own file; importers of the pool find it here too
export { getIfAccepted, type IfAccepted } from "./if-accepted";

export type PoolMember = {
  batchVersionId: number;
  batchId: number;
  batchPublicId: string;
  batchTitle: string;
  version: number;
  organisationId: number;
  organisationName: string;
  fileKey: string;
  fileName: string;
  rowsTotal: number;
  rowsComplete: number;
  residualDf: number;
  decidedAt: Date | null;
  /** the report's delimiter and decimal mark, for reading the file again on export */
  delimiter: string | null;
  decimal: "." | "," | null;
  encoding: string | null;
  /** whether the stored state was checked against the study's current plan */
  currentPlan: boolean;
};

export type StudyPool = {
  studyId: number;
  slug: string;
  title: string;
  planVersion: number;
  plan: Plan;
  /** the merged report; `state` holds the merged engine state (null while the pool is empty) */
  report: ReadinessReport;
  members: PoolMember[];
};

/** A pool's size against its model: the figures the board and the data dictionary show. */
export type PoolFigures = {
  batches: number;
  rows: number;
  completeCases: number;
  parameters: number;
  residualDf: number;
  dfTarget: number;
  /** residual df beyond the plan's target (negative: short of it) */
  headroom: number;
};

/** The PoolFigures of a study's pool (headroom = residual df − df target). */
export function poolFigures(pool: StudyPool): PoolFigures {
  const m = pool.report.model;
  return {
    batches: pool.members.length,
    rows: pool.report.rows.total,
    completeCases: pool.report.rows.complete,
    parameters: m.parameters,
    residualDf: m.residualDf,
    dfTarget: m.dfTarget,
    headroom: m.residualDf - m.dfTarget,
  };
}

export type StudyRef = { id: number; slug: string; title: string; currentPlanVersion: number | null };

/** The columns of a StudyRef, for every read that names a study's pool. */
export const STUDY_REF_COLUMNS = {
  id: studies.id,
  slug: studies.slug,
  title: studies.title,
  currentPlanVersion: studies.currentPlanVersion,
};

type Loaded = { member: PoolMember; state: unknown };

/** The study's current data plan, parsed. Throws when the study has none or it is invalid. */
export async function loadCurrentPlan(
  db: Db,
  study: StudyRef,
): Promise<{ plan: Plan; version: number; planHash: string }> {
  if (study.currentPlanVersion == null) throw new Error(`Study "${study.slug}" has no data plan yet.`);
  const [row] = await db
    .select({ plan: dataPlans.plan, version: dataPlans.version, planHash: dataPlans.planHash })
    .from(dataPlans)
    .where(and(eq(dataPlans.studyId, study.id), eq(dataPlans.version, study.currentPlanVersion)));
  if (!row)
    throw new Error(
      `Study "${study.slug}" points at plan version ${study.currentPlanVersion}, which does not exist.`,
    );
  const parsed = parsePlan(row.plan);
  if (!parsed.ok)
    throw new Error(`The data plan of study "${study.slug}" is not valid; fix it in the plan editor.`);
  return { plan: parsed.plan, version: row.version, planHash: row.planHash };
}

export async function getStudyRef(db: Db, by: { id: number } | { slug: string }): Promise<StudyRef | null> {
  const [s] = await db
    .select(STUDY_REF_COLUMNS)
    .from(studies)
    .where("id" in by ? eq(studies.id, by.id) : eq(studies.slug, by.slug));
  return s ?? null;
}

/** The newest report (and its engine state) of each of the given versions. */
async function newestReports(db: Db, versionIds: number[]) {
  const out = new Map<number, { report: unknown; engineState: unknown; planHash: string }>();
  if (!versionIds.length) return out;
  const rows = await db
    .select({
      versionId: reports.batchVersionId,
      report: reports.report,
      engineState: reports.engineState,
      planHash: dataPlans.planHash,
    })
    .from(reports)
    .innerJoin(dataPlans, eq(dataPlans.id, reports.planId))
    .where(inArray(reports.batchVersionId, versionIds))
    .orderBy(desc(reports.id));
  for (const r of rows)
    if (!out.has(r.versionId))
      out.set(r.versionId, { report: r.report, engineState: r.engineState, planHash: r.planHash });
  return out;
}

export async function withStates(
  db: Db,
  rows: (VersionRow & { decidedAt: Date | null })[],
  planHash: string,
): Promise<Loaded[]> {
  const reps = await newestReports(
    db,
    rows.map((r) => r.batchVersionId),
  );
  const out: Loaded[] = [];
  for (const r of rows) {
    const rep = reps.get(r.batchVersionId);
    // a version without a stored engine state (unreadable, or checked by an engine that kept none) cannot be merged
    if (!rep || !isEngineState(rep.engineState)) continue;
    const body = rep.report as Partial<ReadinessReport>;
    out.push({
      member: {
        ...r,
        rowsTotal: body.rows?.total ?? 0,
        rowsComplete: body.rows?.complete ?? 0,
        residualDf: body.model?.residualDf ?? 0,
        delimiter: body.file?.delimiter ?? null,
        decimal: body.file?.decimal ?? null,
        encoding: body.file?.encoding ?? null,
        currentPlan: rep.planHash === planHash,
      },
      state: rep.engineState,
    });
  }
  return out;
}

/**
 * The accepted versions of a study with their stored engine states, oldest decision first.
 * `asOf` rebuilds the pool as it stood at that moment: versions accepted before it and not
 * yet superseded then (used by the weekly digest to see whether a pool crossed its target).
 */
export async function loadAccepted(
  db: Db,
  studyId: number,
  planHash: string,
  asOf?: Date,
): Promise<Loaded[]> {
  const rows = await db
    .select({
      ...versionColumns,
      decidedAt: decisions.decidedAt,
      state: batchVersions.state,
      stateChangedAt: batchVersions.stateChangedAt,
    })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .innerJoin(
      decisions,
      and(eq(decisions.batchVersionId, batchVersions.id), eq(decisions.decision, "accept")),
    )
    .where(
      and(
        eq(batches.studyId, studyId),
        asOf ? inArray(batchVersions.state, ["accepted", "superseded"]) : eq(batchVersions.state, "accepted"),
      ),
    )
    .orderBy(decisions.decidedAt, batchVersions.id);
  const kept = asOf
    ? rows.filter((r) => r.decidedAt < asOf && (r.state === "accepted" || r.stateChangedAt >= asOf))
    : rows;
  return withStates(db, kept, planHash);
}

/** Merges loaded states into the pool's report with the plan (engine's poolReport). */
export async function poolOf(loaded: Loaded[], plan: Plan): Promise<ReadinessReport> {
  return poolReport(
    loaded.map((l) => l.state),
    plan,
  );
}

/** A study's pool merged afresh from its accepted versions' stored states (what the stored pool must equal). */
export async function computeStudyPool(db: Db, study: StudyRef): Promise<StudyPool> {
  const { plan, version, planHash } = await loadCurrentPlan(db, study);
  const loaded = await loadAccepted(db, study.id, planHash);
  const report = await poolOf(loaded, plan);
  const base = { studyId: study.id, slug: study.slug, title: study.title, planVersion: version, plan };
  return { ...base, report, members: loaded.map((l) => l.member) };
}

/**
 * A study's pool under the current plan: the stored one (lib/pool/stored.ts, no state merged
 * on the request; `report.state` left out), or merged afresh while none is stored for this
 * plan version (a database from before the stored pool, until the worker has built it).
 */
export async function getStudyPool(db: Db, study: StudyRef): Promise<StudyPool> {
  const { plan, version, planHash } = await loadCurrentPlan(db, study);
  const stored = await readStoredPool(db, study.id, version, planHash);
  if (!stored) return computeStudyPool(db, study);
  if (!stored.report) throw new RangeError(stored.error ?? "The pool could not be computed under this plan.");
  const base = { studyId: study.id, slug: study.slug, title: study.title, planVersion: version, plan };
  return { ...base, report: stored.report, members: stored.members };
}

/** The report without its merged engine state (for JSON answers and pages). */
export function withoutState(report: ReadinessReport): Omit<ReadinessReport, "state"> {
  const { state: _state, ...rest } = report;
  void _state;
  return rest;
}
