import "server-only";
import { and, eq, isNotNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { findingComments, users } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import { getBatchForUser } from "./queries";

export type FindingCommentView = {
  id: number;
  code: string;
  columns: string[];
  comment: string;
  author: string;
  createdAt: Date;
  /** true once a decision has sent it to the provider; false for a note still waiting with the version */
  sent: boolean;
};

/**
 * The comments on a version's findings, oldest first: the notes waiting for the decision and the
 * comments sent with it. Providers see only what was sent to them. Null when the version is not
 * the user's to see.
 */
export async function listFindingComments(
  user: SessionUser,
  publicId: string,
  versionNo: number,
): Promise<FindingCommentView[] | null> {
  const batch = await getBatchForUser(user, publicId);
  const version = batch?.versions.find((v) => v.version === versionNo);
  if (!version) return null;
  return versionFindingComments(version.id, user.role === "provider");
}

/** The comments on one version's findings (only those sent with a decision when `sentOnly`). */
export async function versionFindingComments(
  versionId: number,
  sentOnly: boolean,
): Promise<FindingCommentView[]> {
  const rows = await getDb()
    .select({
      id: findingComments.id,
      code: findingComments.findingCode,
      columns: findingComments.columns,
      comment: findingComments.comment,
      author: users.name,
      createdAt: findingComments.createdAt,
      decisionId: findingComments.decisionId,
    })
    .from(findingComments)
    .innerJoin(users, eq(users.id, findingComments.authorId))
    .where(
      and(
        eq(findingComments.batchVersionId, versionId),
        sentOnly ? isNotNull(findingComments.decisionId) : undefined,
      ),
    )
    .orderBy(findingComments.id);
  return rows.map(({ decisionId, ...r }) => ({
    ...r,
    columns: r.columns ? r.columns.split(",") : [],
    sent: decisionId !== null,
  }));
}
