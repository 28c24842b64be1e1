"use server";

import { revalidatePath } from "next/cache";
import { getCurrentUser, type SessionUser } from "@/lib/auth/session";
import { getStudyForUser } from "@/lib/studies/queries-detail";
import { fail, type Result } from "@/lib/result";
import { admitProvider, assignAnalyst, removeProvider, unassignAnalyst, updateStudy } from "@/lib/studies";

type Resolved = { actor: SessionUser; studyId: number } | { error: Result<never> };

/** The signed-in user and the study by slug, within their scope (a study outside it is "not found"). */
async function resolve(slug: string): Promise<Resolved> {
  const actor = await getCurrentUser();
  if (!actor) return { error: fail("Your session has ended. Sign in again.", undefined, "unauthenticated") };
  const study = await getStudyForUser(actor, slug);
  if (!study) return { error: fail("This study is not visible to you (any more).", undefined, "not_found") };
  return { actor, studyId: study.id };
}

function done<T>(slug: string, r: Result<T>): Result<T> {
  if (r.ok) {
    revalidatePath(`/studies/${slug}`);
    revalidatePath("/studies");
  }
  return r;
}

export type StudyChange = { title?: string; description?: string | null; status?: "open" | "closed" };

export async function updateStudyAction(
  slug: string,
  change: StudyChange,
): Promise<Result<{ status: "open" | "closed" }>> {
  const r = await resolve(slug);
  if ("error" in r) return r.error;
  const res = await updateStudy(r.actor.id, r.studyId, change);
  return done(slug, res.ok ? { ok: true, data: { status: res.data.status } } : res);
}

export type MemberKind = "analyst" | "provider";

export async function addMemberAction(
  slug: string,
  kind: MemberKind,
  id: string,
): Promise<Result<{ name: string }>> {
  const r = await resolve(slug);
  if ("error" in r) return r.error;
  const res =
    kind === "analyst"
      ? await assignAnalyst(r.actor.id, r.studyId, id)
      : await admitProvider(r.actor.id, r.studyId, id);
  return done(slug, res.ok ? { ok: true, data: { name: res.data.name } } : res);
}

export async function removeMemberAction(
  slug: string,
  kind: MemberKind,
  id: number,
): Promise<Result<{ name: string }>> {
  const r = await resolve(slug);
  if ("error" in r) return r.error;
  const res =
    kind === "analyst"
      ? await unassignAnalyst(r.actor.id, r.studyId, id)
      : await removeProvider(r.actor.id, r.studyId, id);
  return done(slug, res.ok ? { ok: true, data: { name: res.data.name } } : res);
}
