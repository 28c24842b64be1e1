import "server-only";
import { asc, count, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { organisations, users } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session";

export type OrganisationListItem = {
  id: number;
  name: string;
  slug: string;
  kind: "provider" | "team";
  userCount: number;
};

/**
 * Organisations the user may see: all of them for those who manage users, invite or read the
 * board (admins, leads); otherwise only the user's own.
 */
export async function listOrganisations(user: SessionUser): Promise<OrganisationListItem[]> {
  const all = can(user.role, "user.manage") || can(user.role, "user.invite") || can(user.role, "board.read");
  if (!all && user.organisationId == null) return [];
  return getDb()
    .select({
      id: organisations.id,
      name: organisations.name,
      slug: organisations.slug,
      kind: organisations.kind,
      userCount: count(users.id),
    })
    .from(organisations)
    .leftJoin(users, eq(users.organisationId, organisations.id))
    .where(all ? undefined : eq(organisations.id, user.organisationId ?? 0))
    .groupBy(organisations.id, organisations.name, organisations.slug, organisations.kind)
    .orderBy(asc(organisations.kind), asc(organisations.name));
}
