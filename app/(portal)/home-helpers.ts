import "server-only";
import { redirect } from "next/navigation";
import type { UserRole } from "@/db/schema";
import { requireUser, type SessionUser } from "@/lib/auth/session";
import type { BatchSummary } from "@/lib/batches/queries";
import type { BatchRow } from "@/components/home/batch-table";
import { ROLE_HOME } from "@/components/portal/nav";

/** The signed-in user when they hold `role`; anyone else goes to their own home. */
export async function requireRole(role: UserRole): Promise<SessionUser> {
  const user = await requireUser();
  if (user.role !== role) redirect(ROLE_HOME[user.role]);
  return user;
}

/** Only what the batch table draws crosses to the browser. */
export function toBatchRows(list: BatchSummary[]): BatchRow[] {
  return list.map((b) => ({
    id: b.id,
    publicId: b.publicId,
    title: b.title,
    studyTitle: b.studyTitle,
    organisationName: b.organisationName,
    latestVersion: b.latestVersion,
    state: b.state,
    fileName: b.fileName,
    uploadedAt: b.uploadedAt,
    stateChangedAt: b.stateChangedAt,
  }));
}
