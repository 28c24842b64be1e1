import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { AppError } from "@/lib/errors";
import { getDb, getReadDb, type Db } from "@/db/client";
import { batchVersions, dataPlans, decisions, findingComments, reports, users } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import type { ReadinessReport } from "@/lib/readiness";
import { getBatchForUser, type BatchDetail, type BatchVersionSummary } from "./queries";
import { versionFindingComments, type FindingCommentView } from "./queries-finding-notes";

export type VersionReport = {
  batch: BatchDetail;
  version: BatchVersionSummary;
  plan: { id: number; version: number; plan: unknown };
  /** the newest report of this version; null while the check has not finished */
  report: ReadinessReport | null;
  reportedAt: Date | null;
  decision: {
    decision: "accept" | "bounce";
    comment: string | null;
    decidedBy: string;
    decidedAt: Date;
    findingComments: { code: string; columns: string[]; comment: string }[];
  } | null;
  /** notes on findings waiting for the decision (never shown to providers; empty once decided) */
  notes: FindingCommentView[];
};

/**
 * A batch version with its readiness report, within the user's scope (null otherwise, so
 * callers answer 404 whether it does not exist or is not theirs to see).
 */
export async function getVersionReportForUser(
  user: SessionUser,
  publicId: string,
  versionNo: number,
  /** the batch, when the caller has just loaded it for the same user */
  loaded?: BatchDetail,
): Promise<VersionReport | null> {
  const batch = loaded && loaded.publicId === publicId ? loaded : await getBatchForUser(user, publicId);
  const version = batch?.versions.find((v) => v.version === versionNo);
  if (!batch || !version) return null;
  const db = getDb();
  // three independent reads at once: under load each sequential round trip waits its turn on a
  // busy event loop, so the report's own reads take 3 round trips in a row instead of 5
  const decisionWithComments = async () => {
    const [d] = await db
      .select({
        id: decisions.id,
        decision: decisions.decision,
        comment: decisions.comment,
        decidedBy: users.name,
        decidedAt: decisions.decidedAt,
      })
      .from(decisions)
      .innerJoin(users, eq(users.id, decisions.decidedById))
      .where(eq(decisions.batchVersionId, version.id));
    const comments = d
      ? await db
          .select({
            code: findingComments.findingCode,
            columns: findingComments.columns,
            comment: findingComments.comment,
          })
          .from(findingComments)
          .where(eq(findingComments.decisionId, d.id))
          .orderBy(findingComments.id)
      : [];
    return { d, comments };
  };
  const storedReport = (from: Db) =>
    from
      .select({ report: reports.report, createdAt: reports.createdAt })
      .from(reports)
      .where(and(eq(reports.batchVersionId, version.id)))
      .orderBy(desc(reports.createdAt), desc(reports.id))
      .limit(1);
  // plans and reports never change once written: the replica serves them; a report the version's
  // state says is stored but the replica has not received yet is read from the primary
  const replica = getReadDb();
  const reportRow = async () => {
    const rows = await storedReport(replica);
    const expected = version.state !== "received" && version.state !== "checking";
    return rows.length === 0 && expected && replica !== db ? storedReport(db) : rows;
  };
  const pendingNotes = async () =>
    user.role === "provider" || version.state === "accepted" || version.state === "bounced"
      ? []
      : (await versionFindingComments(version.id, false)).filter((c) => !c.sent);
  const [[plan], [row], { d, comments }, notes] = await Promise.all([
    replica
      .select({ id: dataPlans.id, version: dataPlans.version, plan: dataPlans.plan })
      .from(dataPlans)
      .where(eq(dataPlans.id, version.planId)),
    reportRow(),
    decisionWithComments(),
    pendingNotes(),
  ]);
  return {
    decision: d
      ? {
          decision: d.decision,
          comment: d.comment,
          decidedBy: d.decidedBy,
          decidedAt: d.decidedAt,
          findingComments: comments.map((c) => ({ ...c, columns: c.columns ? c.columns.split(",") : [] })),
        }
      : null,
    batch,
    version,
    plan: plan ?? { id: version.planId, version: 0, plan: null },
    report: (row?.report as ReadinessReport | undefined) ?? null,
    reportedAt: row?.createdAt ?? null,
    notes,
  };
}

/** Where a visible version's file is stored (for re-reading it on the server only). */
export async function getVersionFileKeyForUser(
  user: SessionUser,
  publicId: string,
  versionNo: number,
): Promise<{ found: VersionReport; fileKey: string } | null> {
  const found = await getVersionReportForUser(user, publicId, versionNo);
  if (!found) return null;
  const [row] = await getDb()
    .select({ fileKey: batchVersions.fileKey })
    .from(batchVersions)
    .where(eq(batchVersions.id, found.version.id));
  return row ? { found, fileKey: row.fileKey } : null;
}

/** The answer for a version that does not exist or is not the user's to see (the same words, so existence does not leak). */
export const NO_VISIBLE_VERSION = "No batch version with this id is visible to you.";

/** getVersionFileKeyForUser for a route: the version and its file key, or AppError("not_found"). */
export async function requireVersionFileForUser(user: SessionUser, publicId: string, versionNo: number) {
  const got = await getVersionFileKeyForUser(user, publicId, versionNo);
  if (!got) throw new AppError("not_found", NO_VISIBLE_VERSION);
  return got;
}
