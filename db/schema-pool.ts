/**
 * The pool's questions (re-exported by db/schema.ts, which drizzle-kit reads): what the worker
 * computes from the stored engine states whenever a study's pool changes, and the same with one
 * version under review added.
 */
import { datetime, index, int, json, mysqlTable, text, uniqueIndex } from "drizzle-orm/mysql-core";
import { id, ref } from "./columns";
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
