/**
 * Tributary's tables (MariaDB through Drizzle). Migrations are generated from this file
 * into drizzle/ with `npm run db:generate`; never edit drizzle/ by hand.
 */
import {
  bigint,
  boolean,
  datetime,
  index,
  int,
  json,
  mysqlEnum,
  mysqlTable,
  primaryKey,
  text,
  uniqueIndex,
  varchar,
} from "drizzle-orm/mysql-core";
import { created, id, ref, stamped } from "./columns";

export const ROLES = ["provider", "analyst", "lead", "admin"] as const;
export type UserRole = (typeof ROLES)[number];

export const BATCH_STATES = [
  "received",
  "checking",
  "ready",
  "accepted",
  "bounced",
  "superseded",
  "unreadable",
] as const;
export type BatchState = (typeof BATCH_STATES)[number];

export const organisations = mysqlTable(
  "organisations",
  {
    id: id(),
    name: varchar("name", { length: 200 }).notNull(),
    slug: varchar("slug", { length: 100 }).notNull(),
    /** "provider": sends batches; "team": the analysts' and leads' own organisation */
    kind: mysqlEnum("kind", ["provider", "team"]).notNull().default("provider"),
    createdAt: created(),
  },
  (t) => [uniqueIndex("organisations_slug_uq").on(t.slug)],
);
export type Organisation = typeof organisations.$inferSelect;

export const users = mysqlTable(
  "users",
  {
    id: id(),
    email: varchar("email", { length: 320 }).notNull(),
    name: varchar("name", { length: 200 }).notNull(),
    role: mysqlEnum("role", ROLES).notNull(),
    organisationId: ref("organisation_id").references(() => organisations.id),
    passwordHash: varchar("password_hash", { length: 100 }),
    active: boolean("active").notNull().default(true),
    /** bumped on deactivation and password change: older sessions stop working */
    sessionVersion: int("session_version", { unsigned: true }).notNull().default(1),
    createdAt: created(),
    updatedAt: stamped("updated_at"),
  },
  (t) => [uniqueIndex("users_email_uq").on(t.email), index("users_org_idx").on(t.organisationId)],
);
export type User = typeof users.$inferSelect;

export const studies = mysqlTable(
  "studies",
  {
    id: id(),
    slug: varchar("slug", { length: 100 }).notNull(),
    title: varchar("title", { length: 300 }).notNull(),
    description: text("description"),
    /** who runs the study (the lead's team) */
    teamOrganisationId: ref("team_organisation_id").references(() => organisations.id),
    status: mysqlEnum("status", ["open", "closed"]).notNull().default("open"),
    currentPlanVersion: int("current_plan_version", { unsigned: true }),
    createdById: ref("created_by_id").references(() => users.id),
    createdAt: created(),
  },
  (t) => [uniqueIndex("studies_slug_uq").on(t.slug)],
);
export type Study = typeof studies.$inferSelect;

export const dataPlans = mysqlTable(
  "data_plans",
  {
    id: id(),
    studyId: ref("study_id")
      .notNull()
      .references(() => studies.id),
    version: int("version", { unsigned: true }).notNull(),
    /** the plan JSON, validated by lib/readiness/plan.ts */
    plan: json("plan").notNull(),
    planHash: varchar("plan_hash", { length: 64 }).notNull(),
    note: varchar("note", { length: 500 }),
    createdById: ref("created_by_id").references(() => users.id),
    createdAt: created(),
  },
  (t) => [uniqueIndex("data_plans_study_version_uq").on(t.studyId, t.version)],
);
export type DataPlan = typeof dataPlans.$inferSelect;

export const studyAnalysts = mysqlTable(
  "study_analysts",
  {
    studyId: ref("study_id")
      .notNull()
      .references(() => studies.id),
    userId: ref("user_id")
      .notNull()
      .references(() => users.id),
    createdAt: created(),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.userId] }), index("study_analysts_user_idx").on(t.userId)],
);

export const studyProviders = mysqlTable(
  "study_providers",
  {
    studyId: ref("study_id")
      .notNull()
      .references(() => studies.id),
    organisationId: ref("organisation_id")
      .notNull()
      .references(() => organisations.id),
    createdAt: created(),
  },
  (t) => [
    primaryKey({ columns: [t.studyId, t.organisationId] }),
    index("study_providers_org_idx").on(t.organisationId),
  ],
);

export const batches = mysqlTable(
  "batches",
  {
    id: id(),
    /** random public id used in URLs and the API (not guessable, not sequential) */
    publicId: varchar("public_id", { length: 32 }).notNull(),
    studyId: ref("study_id")
      .notNull()
      .references(() => studies.id),
    organisationId: ref("organisation_id")
      .notNull()
      .references(() => organisations.id),
    title: varchar("title", { length: 300 }).notNull(),
    latestVersion: int("latest_version", { unsigned: true }).notNull().default(0),
    createdById: ref("created_by_id").references(() => users.id),
    createdAt: created(),
  },
  (t) => [
    uniqueIndex("batches_public_id_uq").on(t.publicId),
    index("batches_study_idx").on(t.studyId),
    index("batches_org_idx").on(t.organisationId),
  ],
);
export type Batch = typeof batches.$inferSelect;

export const batchVersions = mysqlTable(
  "batch_versions",
  {
    id: id(),
    batchId: ref("batch_id")
      .notNull()
      .references(() => batches.id),
    version: int("version", { unsigned: true }).notNull(),
    /** the plan version this version is checked against */
    planId: ref("plan_id")
      .notNull()
      .references(() => dataPlans.id),
    fileKey: varchar("file_key", { length: 200 }).notNull(),
    fileUrl: varchar("file_url", { length: 1000 }).notNull(),
    fileName: varchar("file_name", { length: 300 }).notNull(),
    fileSize: bigint("file_size", { mode: "number", unsigned: true }).notNull(),
    contentHash: varchar("content_hash", { length: 64 }),
    state: mysqlEnum("state", BATCH_STATES).notNull().default("received"),
    /** rows read so far by the check (progress) */
    progressRows: bigint("progress_rows", { mode: "number", unsigned: true }).notNull().default(0),
    progressBytes: bigint("progress_bytes", { mode: "number", unsigned: true }).notNull().default(0),
    uploadedById: ref("uploaded_by_id").references(() => users.id),
    /** the API upload's Idempotency-Key: a retry with the same key answers this version again */
    idempotencyKey: varchar("idempotency_key", { length: 200 }),
    uploadedAt: created(),
    stateChangedAt: stamped("state_changed_at"),
  },
  (t) => [
    uniqueIndex("batch_versions_batch_version_uq").on(t.batchId, t.version),
    uniqueIndex("batch_versions_idempotency_uq").on(t.uploadedById, t.idempotencyKey),
    uniqueIndex("batch_versions_file_key_uq").on(t.fileKey),
    index("batch_versions_state_idx").on(t.state),
  ],
);
export type BatchVersion = typeof batchVersions.$inferSelect;

export const JOB_KINDS = ["check", "pool_questions"] as const;

export const checkJobs = mysqlTable(
  "check_jobs",
  {
    id: id(),
    /** "check": a version's file through the engine; "pool_questions": a study's pool questions (lib/pool/questions-job.ts) */
    kind: mysqlEnum("kind", JOB_KINDS).notNull().default("check"),
    /** the version to check (check jobs only) */
    batchVersionId: ref("batch_version_id").references(() => batchVersions.id),
    /** pool questions only: the study whose pool changed */
    studyId: ref("study_id").references(() => studies.id),
    /** pool questions only: the version under review to add ("if accepted"); null for the whole study */
    candidateVersionId: ref("candidate_version_id").references(() => batchVersions.id),
    status: mysqlEnum("status", ["queued", "running", "done", "failed"]).notNull().default("queued"),
    attempts: int("attempts", { unsigned: true }).notNull().default(0),
    lockedBy: varchar("locked_by", { length: 100 }),
    heartbeatAt: datetime("heartbeat_at", { mode: "date", fsp: 3 }),
    runAfter: stamped("run_after"),
    lastError: text("last_error"),
    createdAt: created(),
    finishedAt: datetime("finished_at", { mode: "date", fsp: 3 }),
  },
  (t) => [
    index("check_jobs_status_idx").on(t.status, t.runAfter),
    index("check_jobs_version_idx").on(t.batchVersionId),
    index("check_jobs_kind_study_idx").on(t.kind, t.studyId, t.status),
  ],
);

export const reports = mysqlTable(
  "reports",
  {
    id: id(),
    batchVersionId: ref("batch_version_id")
      .notNull()
      .references(() => batchVersions.id),
    planId: ref("plan_id")
      .notNull()
      .references(() => dataPlans.id),
    status: mysqlEnum("status", ["checked", "unreadable"]).notNull(),
    /** the engine's report JSON (lib/readiness/report.ts) */
    report: json("report").notNull(),
    /** the engine's mergeable state, for the pool */
    engineState: json("engine_state"),
    blockers: int("blockers", { unsigned: true }).notNull().default(0),
    warnings: int("warnings", { unsigned: true }).notNull().default(0),
    notes: int("notes", { unsigned: true }).notNull().default(0),
    completeCases: int("complete_cases", { unsigned: true }).notNull().default(0),
    residualDf: int("residual_df").notNull().default(0),
    engineVersion: varchar("engine_version", { length: 40 }).notNull(),
    createdAt: created(),
  },
  (t) => [index("reports_version_idx").on(t.batchVersionId, t.createdAt)],
);

export const decisions = mysqlTable(
  "decisions",
  {
    id: id(),
    batchVersionId: ref("batch_version_id")
      .notNull()
      .references(() => batchVersions.id),
    decision: mysqlEnum("decision", ["accept", "bounce"]).notNull(),
    comment: text("comment"),
    decidedById: ref("decided_by_id")
      .notNull()
      .references(() => users.id),
    decidedAt: created(),
  },
  // one decision per version: the second of two concurrent decisions fails on this key
  (t) => [uniqueIndex("decisions_version_uq").on(t.batchVersionId)],
);

export const findingComments = mysqlTable(
  "finding_comments",
  {
    id: id(),
    decisionId: ref("decision_id").references(() => decisions.id),
    batchVersionId: ref("batch_version_id")
      .notNull()
      .references(() => batchVersions.id),
    findingCode: varchar("finding_code", { length: 80 }).notNull(),
    columns: varchar("columns", { length: 1000 }).notNull().default(""),
    comment: text("comment").notNull(),
    authorId: ref("author_id")
      .notNull()
      .references(() => users.id),
    createdAt: created(),
  },
  (t) => [index("finding_comments_version_idx").on(t.batchVersionId)],
);

// the audit trail, the e-mail outbox, API tokens and one-time links
export * from "./schema-records";
// the pool's questions, stored by the worker
export * from "./schema-pool";

// the rate limits' counters
export * from "./schema-limits";

// machine-corrected versions: what was applied, and the change log
export * from "./schema-fixes";
