import "server-only";
/** Machine-corrected versions: what was applied, by whom, and the change log (scoped reads). */
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { batchVersions, users, versionFixes } from "@/db/schema";
import type { SessionUser } from "@/lib/auth/session";
import type { FixChange } from "@/lib/readiness";
import type { AppliedProposal } from "./fixes";
import { getBatchForUser, type BatchDetail } from "./queries";

export type VersionFixView = {
  fromVersion: number;
  proposals: AppliedProposal[];
  changeCount: number;
  approvedBy: string;
  at: Date;
  /** the first changed cells (the CSV route has them all) */
  preview: FixChange[];
};

async function fixRow(
  user: SessionUser,
  publicId: string,
  versionNo: number,
  loaded?: BatchDetail,
  withChanges = false,
) {
  const batch = loaded && loaded.publicId === publicId ? loaded : await getBatchForUser(user, publicId);
  const version = batch?.versions.find((v) => v.version === versionNo);
  if (!batch || !version) return undefined;
  const [row] = await getDb()
    .select({
      fromVersion: batchVersions.version,
      proposals: versionFixes.proposals,
      changeCount: versionFixes.changeCount,
      approvedBy: users.name,
      at: versionFixes.createdAt,
      ...(withChanges ? { changes: versionFixes.changes } : {}),
    })
    .from(versionFixes)
    .innerJoin(batchVersions, eq(batchVersions.id, versionFixes.fromVersionId))
    .innerJoin(users, eq(users.id, versionFixes.approvedById))
    .where(eq(versionFixes.batchVersionId, version.id));
  return { version, row: row ?? null };
}

/** Whether a visible version was machine-corrected, and how; null when it was not (undefined: not visible). */
export async function getVersionFixForUser(
  user: SessionUser,
  publicId: string,
  versionNo: number,
  loaded?: BatchDetail,
): Promise<VersionFixView | null | undefined> {
  const got = await fixRow(user, publicId, versionNo, loaded, true);
  if (!got) return undefined;
  if (!got.row) return null;
  const { fromVersion, proposals, changeCount, approvedBy, at } = got.row;
  const changes = ((got.row as { changes?: unknown }).changes ?? []) as FixChange[];
  return {
    fromVersion,
    proposals: proposals as AppliedProposal[],
    changeCount,
    approvedBy,
    at,
    preview: changes.slice(0, 50),
  };
}

/** The change log of a visible machine-corrected version (null: none; undefined: not visible). */
export async function getVersionChangesForUser(
  user: SessionUser,
  publicId: string,
  versionNo: number,
): Promise<{ fileName: string; version: number; changes: FixChange[] } | null | undefined> {
  const got = await fixRow(user, publicId, versionNo, undefined, true);
  if (!got) return undefined;
  if (!got.row) return null;
  return {
    fileName: got.version.fileName,
    version: got.version.version,
    changes: (got.row as { changes?: unknown }).changes as FixChange[],
  };
}
