/**
 * The seeded demo accounts and scratch studies of the integration tests: a session cookie of a
 * seeded user, and a study of a test file's own (a plan, providers, the analyst) so batches of
 * other test files never enter its pool, with the clean-up that leaves the seed as it was.
 */
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { dataPlans, organisations, studies, studyAnalysts, studyProviders, users } from "@/db/schema";
import { BARLEY_PLAN } from "@/lib/demo/plans";
import { hashPlan, parsePlan, type Plan } from "@/lib/readiness";
import { userId } from "./pipeline";
import { sessionCookieFor } from "./session";

/** The seeded user with this e-mail, with the fields a session carries. */
export async function seededUser(email: string) {
  const [u] = await getDb()
    .select({
      id: users.id,
      email: users.email,
      name: users.name,
      role: users.role,
      organisationId: users.organisationId,
      sessionVersion: users.sessionVersion,
    })
    .from(users)
    .where(eq(users.email, email));
  if (!u) throw new Error(`no seeded user ${email}`);
  return u;
}

/** The seeded user as the pages' queries take it (the session's user). */
export async function sessionUser(email: string) {
  return { ...(await seededUser(email)), organisationName: null };
}

/** A session cookie of the seeded user with this e-mail. */
export async function cookieOf(email: string): Promise<string> {
  return sessionCookieFor(await seededUser(email));
}

/** The id of a seeded organisation. */
export async function organisationId(slug: string): Promise<number> {
  const [o] = await getDb()
    .select({ id: organisations.id })
    .from(organisations)
    .where(eq(organisations.slug, slug));
  if (!o) throw new Error(`no seeded organisation ${slug}`);
  return o.id;
}

export interface ScratchStudyOptions {
  title?: string;
  /** the data plan (default the demo barley plan) */
  plan?: Parameters<typeof parsePlan>[0];
  /** the provider organisations admitted (default Harrowgate and Fennick Hill) */
  providers?: string[];
  /** the team organisation the study belongs to, if any */
  team?: string;
  /** the analyst assigned (default analyst@lowmoor.test) */
  analyst?: string;
}

/**
 * A study of the test file's own: plan version 1, the providers admitted and the seeded analyst
 * assigned, written straight to the tables (the services are under test elsewhere).
 */
export async function scratchStudy(
  slug: string,
  opts: ScratchStudyOptions = {},
): Promise<{ id: number; plan: Plan }> {
  const db = getDb();
  const parsed = parsePlan(opts.plan ?? BARLEY_PLAN);
  if (!parsed.ok) throw new Error(`scratch study ${slug}: the plan is invalid`);
  const lead = await userId("lead@lowmoor.test");
  const [s] = await db
    .insert(studies)
    .values({
      slug,
      title: opts.title ?? `Test study ${slug}`,
      teamOrganisationId: opts.team ? await organisationId(opts.team) : null,
      currentPlanVersion: 1,
      createdById: lead,
    })
    .$returningId();
  await db.insert(dataPlans).values({
    studyId: s!.id,
    version: 1,
    plan: parsed.plan,
    planHash: await hashPlan(parsed.plan),
    createdById: lead,
  });
  for (const org of opts.providers ?? ["harrowgate", "fennick-hill"])
    await db.insert(studyProviders).values({ studyId: s!.id, organisationId: await organisationId(org) });
  await db
    .insert(studyAnalysts)
    .values({ studyId: s!.id, userId: await userId(opts.analyst ?? "analyst@lowmoor.test") });
  return { id: s!.id, plan: parsed.plan };
}

/** Removes the scratch study's memberships, so the demo accounts' studies stay as the seed made them. */
export async function releaseScratchStudy(slug: string): Promise<void> {
  const db = getDb();
  const [s] = await db.select({ id: studies.id }).from(studies).where(eq(studies.slug, slug));
  if (!s) return;
  await db.delete(studyProviders).where(eq(studyProviders.studyId, s.id));
  await db.delete(studyAnalysts).where(eq(studyAnalysts.studyId, s.id));
}
