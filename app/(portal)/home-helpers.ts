import "server-only";
import { redirect } from "next/navigation";
import type { UserRole } from "@/db/schema";
import { requireUser, type SessionUser } from "@/lib/auth/session";
import type { BatchSummary, StateCounts } from "@/lib/batches";
import type { StudySummary } from "@/lib/studies";
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

/** The columns every home page's study table shows. */
export function toStudyRow(s: StudySummary & { batchesByState: StateCounts }) {
  return {
    id: s.id,
    title: s.title,
    slug: s.slug,
    team: s.teamOrganisationName,
    status: s.status,
    planVersion: s.currentPlanVersion,
    counts: s.batchesByState,
  };
}
