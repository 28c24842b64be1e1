import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { organisations, studyAnalysts, studyProviders, users } from "@/db/schema";
import { fail, ok, type Result } from "@/lib/result";
import { loadActor } from "@/lib/core/actor";
import { recordAudit, type Tx } from "@/lib/core/audit";
import { isDuplicateKey, runService } from "@/lib/core/write";
import { lockStudy } from "./commands-studies";
import { memberIdSchema } from "./schemas";

export type Membership = { studyId: number; memberId: number; name: string };

function parseId(value: unknown, field: "userId" | "organisationId"): Result<number> {
  const r = memberIdSchema.safeParse(value);
  if (r.success) return ok(r.data);
  return fail(field === "userId" ? "Choose an analyst from the list." : "Choose a provider organisation from the list.", {
    [field]: [field === "userId" ? "Choose an analyst from the list." : "Choose a provider organisation from the list."],
  });
}

async function analystRow(tx: Tx, userId: number) {
  const rows = await tx.select({ id: users.id, name: users.name, role: users.role, active: users.active }).from(users).where(eq(users.id, userId)).limit(1);
  return rows[0] ?? null;
}

async function providerOrg(tx: Tx, organisationId: number) {
  const rows = await tx
    .select({ id: organisations.id, name: organisations.name, kind: organisations.kind })
    .from(organisations)
    .where(eq(organisations.id, organisationId))
    .limit(1);
  return rows[0] ?? null;
}

async function assigned(tx: Tx, studyId: number, userId: number): Promise<boolean> {
  const rows = await tx
    .select({ u: studyAnalysts.userId })
    .from(studyAnalysts)
    .where(and(eq(studyAnalysts.studyId, studyId), eq(studyAnalysts.userId, userId)))
    .limit(1);
  return rows.length > 0;
}

async function admitted(tx: Tx, studyId: number, organisationId: number): Promise<boolean> {
  const rows = await tx
    .select({ o: studyProviders.organisationId })
    .from(studyProviders)
    .where(and(eq(studyProviders.studyId, studyId), eq(studyProviders.organisationId, organisationId)))
    .limit(1);
  return rows.length > 0;
}

/** Assigns an active analyst to a study (study.manage). The analyst then sees its batches and pool. */
export async function assignAnalyst(actorId: number, studyId: number, userIdInput: unknown): Promise<Result<Membership>> {
  return runService("assignAnalyst", async () => {
    const id = parseId(userIdInput, "userId");
    if (!id.ok) return id;
    const db = getDb();
    const actor = await loadActor(db, actorId, "study.manage");
    try {
      return await db.transaction(async (tx) => {
        await lockStudy(tx, studyId);
        const u = await analystRow(tx, id.data);
        if (!u) return fail<Membership>("Check the marked field.", { userId: ["There is no such user."] });
        if (u.role !== "analyst") return fail<Membership>("Check the marked field.", { userId: [`${u.name} is not an analyst; only analysts are assigned to studies.`] });
        if (!u.active) return fail<Membership>("Check the marked field.", { userId: [`${u.name}'s account is deactivated; reactivate it first.`] });
        if (await assigned(tx, studyId, u.id)) return fail<Membership>(`${u.name} is already assigned to this study.`, { userId: ["Already assigned."] }, "conflict");
        await tx.insert(studyAnalysts).values({ studyId, userId: u.id });
        await recordAudit(tx, { actorId: actor.id, action: "study.analyst_assign", objectType: "study", objectId: studyId, studyId, before: null, after: { userId: u.id, name: u.name } });
        return ok({ studyId, memberId: u.id, name: u.name });
      });
    } catch (e) {
      if (isDuplicateKey(e)) return fail("This analyst was assigned at the same moment by someone else.", undefined, "conflict");
      throw e;
    }
  });
}

/** Ends an analyst's assignment to a study (study.manage); their past decisions stay. */
export async function unassignAnalyst(actorId: number, studyId: number, userIdInput: unknown): Promise<Result<Membership>> {
  return runService("unassignAnalyst", async () => {
    const id = parseId(userIdInput, "userId");
    if (!id.ok) return id;
    const db = getDb();
    const actor = await loadActor(db, actorId, "study.manage");
    return db.transaction(async (tx) => {
      await lockStudy(tx, studyId);
      const u = await analystRow(tx, id.data);
      if (!u || !(await assigned(tx, studyId, u.id))) return fail<Membership>("This analyst is not assigned to the study (any more); reload the page.", undefined, "not_found");
      await tx.delete(studyAnalysts).where(and(eq(studyAnalysts.studyId, studyId), eq(studyAnalysts.userId, u.id)));
      await recordAudit(tx, { actorId: actor.id, action: "study.analyst_unassign", objectType: "study", objectId: studyId, studyId, before: { userId: u.id, name: u.name }, after: null });
      return ok({ studyId, memberId: u.id, name: u.name });
    });
  });
}

/** Admits a provider organisation to a study (study.manage): its providers may then upload batches. */
export async function admitProvider(actorId: number, studyId: number, organisationIdInput: unknown): Promise<Result<Membership>> {
  return runService("admitProvider", async () => {
    const id = parseId(organisationIdInput, "organisationId");
    if (!id.ok) return id;
    const db = getDb();
    const actor = await loadActor(db, actorId, "study.manage");
    try {
      return await db.transaction(async (tx) => {
        await lockStudy(tx, studyId);
        const org = await providerOrg(tx, id.data);
        if (!org) return fail<Membership>("Check the marked field.", { organisationId: ["There is no such organisation."] });
        if (org.kind !== "provider")
          return fail<Membership>("Check the marked field.", { organisationId: [`${org.name} is a team, not a provider organisation; only providers send batches.`] });
        if (await admitted(tx, studyId, org.id))
          return fail<Membership>(`${org.name} is already admitted to this study.`, { organisationId: ["Already admitted."] }, "conflict");
        await tx.insert(studyProviders).values({ studyId, organisationId: org.id });
        await recordAudit(tx, { actorId: actor.id, action: "study.provider_admit", objectType: "study", objectId: studyId, studyId, before: null, after: { organisationId: org.id, name: org.name } });
        return ok({ studyId, memberId: org.id, name: org.name });
      });
    } catch (e) {
      if (isDuplicateKey(e)) return fail("This organisation was admitted at the same moment by someone else.", undefined, "conflict");
      throw e;
    }
  });
}

/** Removes a provider organisation from a study (study.manage): no new uploads; its batches stay. */
export async function removeProvider(actorId: number, studyId: number, organisationIdInput: unknown): Promise<Result<Membership>> {
  return runService("removeProvider", async () => {
    const id = parseId(organisationIdInput, "organisationId");
    if (!id.ok) return id;
    const db = getDb();
    const actor = await loadActor(db, actorId, "study.manage");
    return db.transaction(async (tx) => {
      await lockStudy(tx, studyId);
      const org = await providerOrg(tx, id.data);
      if (!org || !(await admitted(tx, studyId, org.id)))
        return fail<Membership>("This organisation is not admitted to the study (any more); reload the page.", undefined, "not_found");
      await tx.delete(studyProviders).where(and(eq(studyProviders.studyId, studyId), eq(studyProviders.organisationId, org.id)));
      await recordAudit(tx, { actorId: actor.id, action: "study.provider_remove", objectType: "study", objectId: studyId, studyId, before: { organisationId: org.id, name: org.name }, after: null });
      return ok({ studyId, memberId: org.id, name: org.name });
    });
  });
}
