/**
 * The pool kept, not recomputed: each study's merged engine state and pool report in
 * `pool_states`, its members' figures in `pool_members`. An accept merges the one new state
 * into the stored one inside the accepting transaction; publishing a plan version or an
 * accepted version leaving the pool (superseded) rebuilds it from the accepted versions.
 * Every change locks the study's row first, so two accepts at once both land, one after the
 * other. No `server-only`: services, scripts and the worker call it.
 */
import { and, desc, eq, inArray, notInArray, sql } from "drizzle-orm";
import type { Db, DbOrTx } from "@/db/client";
import {
  batches,
  batchVersions,
  dataPlans,
  decisions,
  poolMembers,
  poolStates,
  reports,
  studies,
} from "@/db/schema";
import { isEngineState, parsePlan, poolReport, type Plan, type ReadinessReport } from "@/lib/readiness";

/** A member's figures and stored state, as merged. */
type MemberState = typeof poolMembers.$inferInsert & { state: unknown };

/** The study's current plan version, read under a lock on the study's row (null: no plan yet). */
async function lockStudy(tx: DbOrTx, studyId: number): Promise<number | null> {
  const [s] = await tx
    .select({ planVersion: studies.currentPlanVersion })
    .from(studies)
    .where(eq(studies.id, studyId))
    .for("update");
  if (!s) throw new Error(`There is no study ${studyId}.`);
  return s.planVersion;
}

/** A plan version of a study, parsed; a locking read, so a version published a moment ago is seen. */
async function planAt(tx: DbOrTx, studyId: number, version: number): Promise<Plan> {
  const [row] = await tx
    .select({ plan: dataPlans.plan })
    .from(dataPlans)
    .where(and(eq(dataPlans.studyId, studyId), eq(dataPlans.version, version)))
    .for("update");
  const parsed = row ? parsePlan(row.plan) : null;
  if (!parsed?.ok) throw new Error(`Plan version ${version} of study ${studyId} is missing or not valid.`);
  return parsed.plan;
}

/** The accepted versions of a study, oldest decision first (the order the pool merges them in). */
export async function acceptedInOrder(db: DbOrTx, studyId: number): Promise<number[]> {
  const rows = await db
    .select({ id: batchVersions.id })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(
      decisions,
      and(eq(decisions.batchVersionId, batchVersions.id), eq(decisions.decision, "accept")),
    )
    .where(and(eq(batches.studyId, studyId), eq(batchVersions.state, "accepted")))
    .orderBy(decisions.decidedAt, batchVersions.id);
  return rows.map((r) => r.id);
}

const text = (path: string) => sql<string | null>`json_unquote(json_extract(${reports.report}, ${path}))`;

/**
 * The newest report's figures and engine state of each version, in decision order; versions
 * without a stored engine state (unreadable, or from an engine that kept none) are left out.
 */
async function memberStates(db: DbOrTx, studyId: number, ids: number[]): Promise<MemberState[]> {
  if (!ids.length) return [];
  const rows = await db
    .select({
      versionId: reports.batchVersionId,
      reportId: reports.id,
      planHash: dataPlans.planHash,
      rowsTotal: sql<number | null>`json_value(${reports.report}, '$.rows.total')`,
      rowsComplete: sql<number | null>`json_value(${reports.report}, '$.rows.complete')`,
      residualDf: reports.residualDf,
      delimiter: text("$.file.delimiter"),
      decimalMark: text("$.file.decimal"),
      encoding: text("$.file.encoding"),
      engineState: reports.engineState,
      decidedAt: decisions.decidedAt,
    })
    .from(reports)
    .innerJoin(dataPlans, eq(dataPlans.id, reports.planId))
    .leftJoin(decisions, eq(decisions.batchVersionId, reports.batchVersionId))
    .where(inArray(reports.batchVersionId, ids))
    .orderBy(desc(reports.id));
  const newest = new Map<number, (typeof rows)[number]>();
  for (const r of rows) if (!newest.has(r.versionId)) newest.set(r.versionId, r);
  const at = (id: number) => newest.get(id)?.decidedAt?.getTime() ?? Infinity;
  return [...ids]
    .sort((a, b) => at(a) - at(b) || a - b)
    .flatMap((id) => {
      const r = newest.get(id);
      const state = r?.engineState;
      if (!r || !isEngineState(state)) return [];
      const nul = (v: string | null) => (v === "null" ? null : v);
      return [
        {
          batchVersionId: id,
          studyId,
          reportId: r.reportId,
          planHash: r.planHash,
          rowsTotal: Number(r.rowsTotal ?? 0),
          rowsComplete: Number(r.rowsComplete ?? 0),
          residualDf: r.residualDf,
          delimiter: nul(r.delimiter),
          decimalMark: nul(r.decimalMark)?.slice(0, 1) ?? null,
          encoding: nul(r.encoding),
          state,
        },
      ];
    });
}

type Computed = { report: ReadinessReport | null; error: string | null };

/** The engine's poolReport, or its plain message when a state does not fit the plan. */
async function merged(states: unknown[], plan: Plan): Promise<Computed> {
  try {
    return { report: await poolReport(states, plan), error: null };
  } catch (e) {
    if (e instanceof RangeError) return { report: null, error: e.message };
    throw e;
  }
}

async function storeRow(
  tx: DbOrTx,
  studyId: number,
  planVersion: number,
  versionIds: number[],
  c: Computed,
): Promise<void> {
  const { state = null, ...report } = c.report ?? {};
  const m = c.report?.model;
  const row = {
    studyId,
    planVersion,
    versionIds: [...versionIds].sort((a, b) => a - b),
    batches: versionIds.length,
    rowsTotal: c.report?.rows.total ?? 0,
    rowsComplete: c.report?.rows.complete ?? 0,
    parameters: m?.parameters ?? 0,
    residualDf: m?.residualDf ?? 0,
    dfTarget: m?.dfTarget ?? 0,
    state: c.report && versionIds.length ? state : null,
    report: c.report ? report : null,
    error: c.error,
  };
  await tx.insert(poolStates).values(row).onDuplicateKeyUpdate({ set: row });
}

/**
 * Rebuilds a study's stored pool from the given accepted versions (by default: the stored
 * members, or every accepted version when nothing is stored yet) under its current plan.
 * Call inside the transaction that changed the pool: a plan published, a version leaving it.
 */
export async function rebuildStoredPool(
  tx: DbOrTx,
  studyId: number,
  opts: { without?: number; ids?: number[] } = {},
): Promise<void> {
  const planVersion = await lockStudy(tx, studyId);
  if (planVersion == null) return;
  const [row] = await tx
    .select({ versionIds: poolStates.versionIds })
    .from(poolStates)
    .where(eq(poolStates.studyId, studyId))
    .for("update");
  // the stored list is read under the lock (the newest committed); a fresh query could miss an accept that just landed
  const base = opts.ids ?? row?.versionIds ?? (await acceptedInOrder(tx, studyId));
  const ids = base.filter((id) => id !== opts.without);
  const members = await memberStates(tx, studyId, ids);
  const plan = await planAt(tx, studyId, planVersion);
  const computed = await merged(
    members.map((m) => m.state),
    plan,
  );
  const kept = members.map((m) => m.batchVersionId);
  await storeRow(tx, studyId, planVersion, kept, computed);
  await tx
    .delete(poolMembers)
    .where(
      and(
        eq(poolMembers.studyId, studyId),
        kept.length ? notInArray(poolMembers.batchVersionId, kept) : undefined,
      ),
    );
  for (const { state: _s, ...m } of members) {
    void _s;
    await tx.insert(poolMembers).values(m).onDuplicateKeyUpdate({ set: m });
  }
}

/**
 * Adds a version just accepted (in this transaction) to its study's stored pool: the stored
 * merged state and the version's state merged by the engine, the pool's report computed
 * again from that one merged state. A pool not stored yet, stored under another plan version
 * or that could not be merged is rebuilt instead.
 */
export async function addToStoredPool(tx: DbOrTx, studyId: number, versionId: number): Promise<void> {
  const planVersion = await lockStudy(tx, studyId);
  if (planVersion == null) return;
  const [row] = await tx
    .select({
      planVersion: poolStates.planVersion,
      versionIds: poolStates.versionIds,
      state: poolStates.state,
    })
    .from(poolStates)
    .where(eq(poolStates.studyId, studyId))
    .for("update");
  const fits =
    row && row.planVersion === planVersion && (row.versionIds.length === 0 || isEngineState(row.state));
  if (!fits) return rebuildStoredPool(tx, studyId, row ? { ids: [...row.versionIds, versionId] } : {});
  if (row.versionIds.includes(versionId)) return;
  const [mine] = await memberStates(tx, studyId, [versionId]);
  // a version without an engine state never enters a pool (as when the pool is merged afresh)
  if (!mine) return;
  const plan = await planAt(tx, studyId, planVersion);
  const computed = await merged(row.versionIds.length ? [row.state, mine.state] : [mine.state], plan);
  if (computed.error) return rebuildStoredPool(tx, studyId, { ids: [...row.versionIds, versionId] });
  await storeRow(tx, studyId, planVersion, [...row.versionIds, versionId], computed);
  const { state: _s, ...m } = mine;
  void _s;
  await tx.insert(poolMembers).values(m).onDuplicateKeyUpdate({ set: m });
}

/**
 * Rebuilds the stored pool of every study with a plan whose stored pool is missing, under
 * another plan version or over other versions than the accepted ones (a database from before
 * the stored pool). The worker runs it at its start. Returns how many it rebuilt.
 */
export async function rebuildStalePools(db: Db): Promise<number> {
  const rows = await db
    .select({ id: studies.id, planVersion: studies.currentPlanVersion, stored: poolStates.planVersion })
    .from(studies)
    .leftJoin(poolStates, eq(poolStates.studyId, studies.id));
  const ids = new Map(
    (await db.select({ studyId: poolStates.studyId, ids: poolStates.versionIds }).from(poolStates)).map(
      (r) => [r.studyId, r.ids.join(",")],
    ),
  );
  let rebuilt = 0;
  for (const s of rows) {
    if (s.planVersion == null) continue;
    const accepted = (await acceptedInOrder(db, s.id)).sort((a, b) => a - b).join(",");
    if (s.stored === s.planVersion && ids.get(s.id) === accepted) continue;
    await db.transaction(async (tx) => rebuildStoredPool(tx, s.id, { ids: await acceptedInOrder(tx, s.id) }));
    rebuilt++;
  }
  return rebuilt;
}
