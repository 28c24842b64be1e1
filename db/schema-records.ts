/**
 * Tables beside the workflow (re-exported by db/schema.ts, which drizzle-kit reads): the audit
 * trail, the e-mail outbox, API tokens and the one-time links of invitations and resets.
 */
import {
  datetime,
  index,
  int,
  json,
  mysqlEnum,
  mysqlTable,
  text,
  uniqueIndex,
  varchar,
} from "drizzle-orm/mysql-core";
import { sql } from "drizzle-orm";
import { created, id, ref } from "./columns";
import { users } from "./schema";

export const auditEvents = mysqlTable(
  "audit_events",
  {
    id: id(),
    actorId: ref("actor_id").references(() => users.id),
    action: varchar("action", { length: 80 }).notNull(),
    objectType: varchar("object_type", { length: 40 }).notNull(),
    objectId: varchar("object_id", { length: 64 }).notNull(),
    studyId: ref("study_id"),
    batchId: ref("batch_id"),
    before: json("before"),
    after: json("after"),
    createdAt: created(),
  },
  (t) => [
    index("audit_object_idx").on(t.objectType, t.objectId),
    index("audit_batch_idx").on(t.batchId),
    index("audit_created_idx").on(t.createdAt),
  ],
);

export const emailOutbox = mysqlTable(
  "email_outbox",
  {
    id: id(),
    /** stable key of what the message is about: never sent twice */
    dedupeKey: varchar("dedupe_key", { length: 200 }).notNull(),
    kind: varchar("kind", { length: 40 }).notNull(),
    toAddress: varchar("to_address", { length: 320 }).notNull(),
    subject: varchar("subject", { length: 500 }).notNull(),
    textBody: text("text_body").notNull(),
    htmlBody: text("html_body").notNull(),
    batchId: ref("batch_id"),
    status: mysqlEnum("status", ["pending", "sending", "sent", "failed"]).notNull().default("pending"),
    attempts: int("attempts", { unsigned: true }).notNull().default(0),
    nextAttemptAt: datetime("next_attempt_at", { mode: "date", fsp: 3 })
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    lastError: text("last_error"),
    messageId: varchar("message_id", { length: 300 }),
    sentAt: datetime("sent_at", { mode: "date", fsp: 3 }),
    createdAt: created(),
  },
  (t) => [
    uniqueIndex("email_outbox_dedupe_uq").on(t.dedupeKey),
    index("email_outbox_status_idx").on(t.status, t.nextAttemptAt),
  ],
);

export const apiTokens = mysqlTable(
  "api_tokens",
  {
    id: id(),
    userId: ref("user_id")
      .notNull()
      .references(() => users.id),
    name: varchar("name", { length: 100 }).notNull(),
    /** sha-256 of the token; the token itself is shown once */
    tokenHash: varchar("token_hash", { length: 64 }).notNull(),
    prefix: varchar("prefix", { length: 16 }).notNull(),
    createdAt: created(),
    lastUsedAt: datetime("last_used_at", { mode: "date", fsp: 3 }),
    revokedAt: datetime("revoked_at", { mode: "date", fsp: 3 }),
  },
  (t) => [uniqueIndex("api_tokens_hash_uq").on(t.tokenHash), index("api_tokens_user_idx").on(t.userId)],
);

/** one-time links: invitations (set a password) and password resets */
export const userTokens = mysqlTable(
  "user_tokens",
  {
    id: id(),
    userId: ref("user_id")
      .notNull()
      .references(() => users.id),
    kind: mysqlEnum("kind", ["invite", "reset"]).notNull(),
    tokenHash: varchar("token_hash", { length: 64 }).notNull(),
    expiresAt: datetime("expires_at", { mode: "date", fsp: 3 }).notNull(),
    usedAt: datetime("used_at", { mode: "date", fsp: 3 }),
    createdAt: created(),
  },
  (t) => [uniqueIndex("user_tokens_hash_uq").on(t.tokenHash)],
);
