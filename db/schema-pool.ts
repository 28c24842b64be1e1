/**
 * The pool's questions (re-exported by db/schema.ts, which drizzle-kit reads): what the worker
 * computes from the stored engine states whenever a study's pool changes, and the same with one
 * version under review added.
 */
import { datetime, index, int, json, mysqlTable, text, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { id, ref, stamped } from "./columns";
import { batchVersions, studies } from "./schema";

/**
 * A study's pool questions (poolability, influence, overall F, selection preview), computed by
 * the worker from the stored engine states whenever the pool changes; pages read this row.
 */
export const poolQuestions = mysqlTable(
  "pool_questions",
  {
    id: id(),
    studyId: ref("study_id")
      .notNull()
      .references(() => studies.id),
    /** the plan version the figures were computed under */
    planVersion: int("plan_version", { unsigned: true }).notNull(),
    /** the accepted batch version ids the figures cover, ascending */
    versionIds: json("version_ids").$type<number[]>().notNull(),
    /** the job that computed it: a later job's figures replace an earlier one's, never the other way */
    jobId: ref("job_id").notNull(),
    computedAt: datetime("computed_at", { mode: "date", fsp: 3 }).notNull(),
    /** PoolQuestions (lib/readiness/pooling), JSON; null when they could not be computed */
    result: json("result"),
    /** why they could not be computed (a state that does not fit the plan), in plain words */
    error: text("error"),
  },
  (t) => [uniqueIndex("pool_questions_study_uq").on(t.studyId)],
);

/** "If accepted": the pool questions with one version under review added, per version. */
export const ifAcceptedQuestions = mysqlTable(
  "if_accepted_questions",
  {
    id: id(),
    batchVersionId: ref("batch_version_id")
      .notNull()
      .references(() => batchVersions.id),
    studyId: ref("study_id")
      .notNull()
      .references(() => studies.id),
    planVersion: int("plan_version", { unsigned: true }).notNull(),
    /** the accepted version ids of the pool it was added to, ascending */
    versionIds: json("version_ids").$type<number[]>().notNull(),
    jobId: ref("job_id").notNull(),
    computedAt: datetime("computed_at", { mode: "date", fsp: 3 }).notNull(),
    result: json("result"),
    error: text("error"),
  },
  (t) => [
    uniqueIndex("if_accepted_questions_version_uq").on(t.batchVersionId),
    index("if_accepted_questions_study_idx").on(t.studyId),
  ],
);

/**
 * A study's pool kept, not recomputed: the merged engine state of its accepted versions and the
 * pool's report (figures and findings, without the state), updated in the transaction that
 * accepts a version and rebuilt from the accepted versions when a plan version is published
 * or an accepted version leaves the pool (lib/pool/stored.ts). Pages and the board read it.
 */
export const poolStates = mysqlTable(
  "pool_states",
  {
    id: id(),
    studyId: ref("study_id")
      .notNull()
      .references(() => studies.id),
    /** the plan version the report was computed under */
    planVersion: int("plan_version", { unsigned: true }).notNull(),
    /** the accepted batch version ids merged, ascending */
    versionIds: json("version_ids").$type<number[]>().notNull(),
    batches: int("batches", { unsigned: true }).notNull().default(0),
    rowsTotal: int("rows_total", { unsigned: true }).notNull().default(0),
    rowsComplete: int("rows_complete", { unsigned: true }).notNull().default(0),
    parameters: int("parameters", { unsigned: true }).notNull().default(0),
    residualDf: int("residual_df").notNull().default(0),
    dfTarget: int("df_target", { unsigned: true }).notNull().default(0),
    /** the merged engine state (null while the pool is empty or when it could not be merged) */
    state: json("state"),
    /** the pool's ReadinessReport without its state (null when it could not be computed) */
    report: json("report"),
    /** why the pool could not be computed under the plan, in plain words */
    error: text("error"),
    updatedAt: stamped("updated_at"),
  },
  (t) => [uniqueIndex("pool_states_study_uq").on(t.studyId)],
);

/** The accepted versions in a stored pool with the figures of each one's report, for the members table. */
export const poolMembers = mysqlTable(
  "pool_members",
  {
    batchVersionId: ref("batch_version_id")
      .primaryKey()
      .references(() => batchVersions.id),
    studyId: ref("study_id")
      .notNull()
      .references(() => studies.id),
    reportId: ref("report_id").notNull(),
    planHash: varchar("plan_hash", { length: 64 }).notNull(),
    rowsTotal: int("rows_total", { unsigned: true }).notNull(),
    rowsComplete: int("rows_complete", { unsigned: true }).notNull(),
    residualDf: int("residual_df").notNull(),
    delimiter: varchar("delimiter", { length: 8 }),
    decimalMark: varchar("decimal_mark", { length: 1 }),
    encoding: varchar("encoding", { length: 40 }),
  },
  (t) => [index("pool_members_study_idx").on(t.studyId)],
);
