/**
 * Machine-corrected versions (re-exported by db/schema.ts, which drizzle-kit reads).
 */
import { int, json, mysqlTable, uniqueIndex } from "drizzle-orm/mysql-core";
import { created, id, ref } from "./columns";
import { batchVersions, users } from "./schema";

/**
 * A version made by applying fix proposals to an earlier version (issue 12): which version, which
 * proposals, who approved them, and the change log (every changed cell). The earlier version and
 * its file stay as they were.
 */
export const versionFixes = mysqlTable(
  "version_fixes",
  {
    id: id(),
    /** the corrected version */
    batchVersionId: ref("batch_version_id")
      .notNull()
      .references(() => batchVersions.id),
    /** the version it was produced from */
    fromVersionId: ref("from_version_id")
      .notNull()
      .references(() => batchVersions.id),
    /** the applied proposals: [{id, code, column, cells, message}] */
    proposals: json("proposals").notNull(),
    /** the change log: [{row, column, before, after, proposal}] (lib/readiness FixChange) */
    changes: json("changes").notNull(),
    changeCount: int("change_count", { unsigned: true }).notNull(),
    /** the provider who chose the proposals and sent the corrected file */
    approvedById: ref("approved_by_id")
      .notNull()
      .references(() => users.id),
    createdAt: created(),
  },
  (t) => [uniqueIndex("version_fixes_version_uq").on(t.batchVersionId)],
);
export type VersionFix = typeof versionFixes.$inferSelect;
