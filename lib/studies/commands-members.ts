import "server-only";
/**
 * A study's members: analysts assigned to it and provider organisations admitted to it
 * (study.manage). The four changes share one shape: parse the chosen id, lock the study,
 * look the member up, check, change the link table, write the audit row.
 */
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import type { Tx } from "@/db/client";
import { organisations, studyAnalysts, studyProviders, users } from "@/db/schema";
import { write } from "@/lib/core/write";
import { fail, ok, type Result } from "@/lib/result";
import { lockStudy } from "./commands-studies";
import { memberIdSchema } from "./schemas";

export type Membership = { studyId: number; memberId: number; name: string };

type Member = { id: number; name: string };

/** One kind of membership: its field, its table, and what may be linked. */
type Kind = {
  field: "userId" | "organisationId";
  choose: string;
  /** the member, or a message saying why it cannot be linked */
  find: (tx: Tx, id: number) => Promise<Member | string | null>;
  linked: (tx: Tx, studyId: number, id: number) => Promise<boolean>;
  link: (tx: Tx, studyId: number, id: number) => Promise<unknown>;
  unlink: (tx: Tx, studyId: number, id: number) => Promise<unknown>;
  audit: { add: string; remove: string; key: "userId" | "organisationId" };
  already: (m: Member) => string;
  gone: string;
  race: string;
};

const analystLink = (studyId: number, id: number) =>
  and(eq(studyAnalysts.studyId, studyId), eq(studyAnalysts.userId, id));
const providerLink = (studyId: number, id: number) =>
  and(eq(studyProviders.studyId, studyId), eq(studyProviders.organisationId, id));

const ANALYST: Kind = {
  field: "userId",
  choose: "Choose an analyst from the list.",
  find: async (tx, id) => {
    const [u] = await tx
      .select({ id: users.id, name: users.name, role: users.role, active: users.active })
      .from(users)
      .where(eq(users.id, id));
    if (!u) return null;
    if (u.role !== "analyst") return `${u.name} is not an analyst; only analysts are assigned to studies.`;
    if (!u.active) return `${u.name}'s account is deactivated; reactivate it first.`;
    return u;
  },
  linked: async (tx, s, id) =>
    (await tx.select({ u: studyAnalysts.userId }).from(studyAnalysts).where(analystLink(s, id))).length > 0,
  link: (tx, studyId, userId) => tx.insert(studyAnalysts).values({ studyId, userId }),
  unlink: (tx, s, id) => tx.delete(studyAnalysts).where(analystLink(s, id)),
  audit: { add: "study.analyst_assign", remove: "study.analyst_unassign", key: "userId" },
  already: (m) => `${m.name} is already assigned to this study.`,
  gone: "This analyst is not assigned to the study (any more); reload the page.",
  race: "This analyst was assigned at the same moment by someone else.",
};

const PROVIDER: Kind = {
  field: "organisationId",
  choose: "Choose a provider organisation from the list.",
  find: async (tx, id) => {
    const [o] = await tx
      .select({ id: organisations.id, name: organisations.name, kind: organisations.kind })
      .from(organisations)
      .where(eq(organisations.id, id));
    if (!o) return null;
    if (o.kind !== "provider")
      return `${o.name} is a team, not a provider organisation; only providers send batches.`;
    return o;
  },
  linked: async (tx, s, id) =>
    (await tx.select({ o: studyProviders.organisationId }).from(studyProviders).where(providerLink(s, id)))
      .length > 0,
  link: (tx, studyId, organisationId) => tx.insert(studyProviders).values({ studyId, organisationId }),
  unlink: (tx, s, id) => tx.delete(studyProviders).where(providerLink(s, id)),
  audit: { add: "study.provider_admit", remove: "study.provider_remove", key: "organisationId" },
  already: (m) => `${m.name} is already admitted to this study.`,
  gone: "This organisation is not admitted to the study (any more); reload the page.",
  race: "This organisation was admitted at the same moment by someone else.",
};

const NO_SUCH = { userId: "There is no such user.", organisationId: "There is no such organisation." };
const ALREADY = { userId: "Already assigned.", organisationId: "Already admitted." };

function change(kind: Kind, add: boolean, name: string, actorId: number, studyId: number, input: unknown) {
  const field = kind.field;
  return write({
    name,
    actorId,
    may: "study.manage",
    schema: z.object({ [field]: memberIdSchema }),
    input: { [field]: input },
    invalid: () => fail(kind.choose, { [field]: [kind.choose] }),
    onDuplicate: () => fail(kind.race, undefined, "conflict"),
    run: async ({ tx, input: parsed, audit }): Promise<Result<Membership>> => {
      const id = parsed[field] as number;
      await lockStudy(tx, studyId);
      const key = kind.audit.key;
      const onStudy = { objectType: "study" as const, objectId: studyId, studyId };
      if (!add) {
        // removing needs only that the link exists: a deactivated analyst can be unassigned
        const member = await anyMember(tx, kind, id);
        if (!member || !(await kind.linked(tx, studyId, member.id)))
          return fail(kind.gone, undefined, "not_found");
        await kind.unlink(tx, studyId, member.id);
        const trace = { [key]: member.id, name: member.name };
        await audit({ ...onStudy, action: kind.audit.remove, before: trace, after: null });
        return ok({ studyId, memberId: member.id, name: member.name });
      }
      const found = await kind.find(tx, id);
      if (found === null || typeof found === "string") {
        return fail("Check the marked field.", { [field]: [found ?? NO_SUCH[field]] });
      }
      if (await kind.linked(tx, studyId, found.id)) {
        return fail(kind.already(found), { [field]: [ALREADY[field]] }, "conflict");
      }
      await kind.link(tx, studyId, found.id);
      const trace = { [key]: found.id, name: found.name };
      await audit({ ...onStudy, action: kind.audit.add, before: null, after: trace });
      return ok({ studyId, memberId: found.id, name: found.name });
    },
  });
}

/** The user or organisation by id whatever its role or kind (for removing a link). */
async function anyMember(tx: Tx, kind: Kind, id: number): Promise<Member | null> {
  const table = kind.field === "userId" ? users : organisations;
  const [row] = await tx.select({ id: table.id, name: table.name }).from(table).where(eq(table.id, id));
  return row ?? null;
}

/** Assigns an active analyst to a study (study.manage). The analyst then sees its batches and pool. */
export const assignAnalyst = (actorId: number, studyId: number, userId: unknown) =>
  change(ANALYST, true, "assignAnalyst", actorId, studyId, userId);

/** Ends an analyst's assignment to a study (study.manage); their past decisions stay. */
export const unassignAnalyst = (actorId: number, studyId: number, userId: unknown) =>
  change(ANALYST, false, "unassignAnalyst", actorId, studyId, userId);

/** Admits a provider organisation to a study (study.manage): its providers may then upload batches. */
export const admitProvider = (actorId: number, studyId: number, organisationId: unknown) =>
  change(PROVIDER, true, "admitProvider", actorId, studyId, organisationId);

/** Removes a provider organisation from a study (study.manage): no new uploads; its batches stay. */
export const removeProvider = (actorId: number, studyId: number, organisationId: unknown) =>
  change(PROVIDER, false, "removeProvider", actorId, studyId, organisationId);
