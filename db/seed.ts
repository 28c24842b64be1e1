/**
 * The demo scenario (README.md "Using Tributary, role by role"): organisations, sign-ins of every role, the two studies with
 * version 1 of their data plans, and who reviews and supplies each study. Idempotent: rows are
 * matched by slug, e-mail or key, so running it again adds nothing; it restores the demo accounts
 * to the documented role, organisation, active flag and password.
 *
 *   npx tsx db/seed.ts        (reads DATABASE_URL from the environment, then .env)
 */
import path from "node:path";
import { pathToFileURL } from "node:url";
import bcrypt from "bcryptjs";
import { and, eq, isNull, sql } from "drizzle-orm";
import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import * as schema from "./schema";
import { DEMO_ORGANISATIONS, DEMO_PASSWORD, DEMO_STUDIES, DEMO_USERS } from "@/lib/demo";
import { hashPlan } from "@/lib/readiness";
import { parsePlan, type Plan } from "@/lib/readiness";
import { databaseUrlOrExit, describeDbError, redact } from "./migrate";

const { organisations, users, studies, dataPlans, studyAnalysts, studyProviders, batchVersions } = schema;

export type SeedDb = MySql2Database<typeof schema>;

export interface SeedSummary {
  organisations: number;
  users: number;
  studies: number;
  plansAdded: number;
  usersAdded: number;
  passwordsReset: number;
}

/** bcrypt cost of the demo hashes (the library's default). */
const BCRYPT_COST = 10;

function parsedPlanOrThrow(slug: string, input: unknown): Plan {
  const r = parsePlan(input);
  if (!r.ok) {
    const lines = r.issues.map((i) => `  ${i.path || "(plan)"}: ${i.message}`).join("\n");
    throw new Error(`the demo data plan of "${slug}" is not valid:\n${lines}`);
  }
  return r.plan;
}

/** Writes the demo scenario into `db` (schema already migrated). Safe to run any number of times. */
export async function seedDemo(db: SeedDb): Promise<SeedSummary> {
  const plans = DEMO_STUDIES.map((s) => ({ study: s, plan: parsedPlanOrThrow(s.slug, s.plan) }));
  const summary: SeedSummary = {
    organisations: 0,
    users: 0,
    studies: 0,
    plansAdded: 0,
    usersAdded: 0,
    passwordsReset: 0,
  };

  // bcrypt is slow on purpose: hash before the transaction, and only what needs it
  const existing = await db
    .select({ email: users.email, passwordHash: users.passwordHash })
    .from(users)
    .where(
      sql`${users.email} in (${sql.join(
        DEMO_USERS.map((u) => sql`${u.email}`),
        sql`, `,
      )})`,
    );
  const hashes = new Map<string, string | null>();
  for (const u of DEMO_USERS) {
    const row = existing.find((e) => e.email === u.email);
    const current = row?.passwordHash ?? null;
    const ok = current !== null && (await bcrypt.compare(DEMO_PASSWORD, current));
    hashes.set(u.email, ok ? null : await bcrypt.hash(DEMO_PASSWORD, BCRYPT_COST));
  }

  await db.transaction(async (tx) => {
    for (const o of DEMO_ORGANISATIONS) {
      await tx
        .insert(organisations)
        .values(o)
        .onDuplicateKeyUpdate({ set: { name: o.name, kind: o.kind } });
    }
    const orgRows = await tx.select({ id: organisations.id, slug: organisations.slug }).from(organisations);
    const orgId = (slug: string): number => {
      const row = orgRows.find((r) => r.slug === slug);
      if (!row) throw new Error(`organisation "${slug}" is missing after the upsert`);
      return row.id;
    };
    summary.organisations = DEMO_ORGANISATIONS.length;

    for (const u of DEMO_USERS) {
      const newHash = hashes.get(u.email) ?? null;
      const [row] = await tx.select({ id: users.id }).from(users).where(eq(users.email, u.email));
      const identity = {
        name: u.name,
        role: u.role,
        organisationId: orgId(u.organisationSlug),
        active: u.active,
      };
      if (!row) {
        await tx.insert(users).values({
          email: u.email,
          ...identity,
          passwordHash: newHash ?? (await bcrypt.hash(DEMO_PASSWORD, BCRYPT_COST)),
        });
        summary.usersAdded++;
      } else if (newHash) {
        // a changed password is put back; older sessions of the account stop working
        await tx
          .update(users)
          .set({
            ...identity,
            passwordHash: newHash,
            sessionVersion: sql`${users.sessionVersion} + 1`,
            updatedAt: new Date(),
          })
          .where(eq(users.id, row.id));
        summary.passwordsReset++;
      } else {
        await tx.update(users).set(identity).where(eq(users.id, row.id));
      }
    }
    const userRows = await tx.select({ id: users.id, email: users.email }).from(users);
    const userId = (email: string): number => {
      const row = userRows.find((r) => r.email === email);
      if (!row) throw new Error(`user "${email}" is missing after the upsert`);
      return row.id;
    };
    summary.users = DEMO_USERS.length;

    for (const { study: s, plan } of plans) {
      await tx
        .insert(studies)
        .values({
          slug: s.slug,
          title: s.title,
          description: s.description,
          teamOrganisationId: orgId(s.teamSlug),
          createdById: userId(s.createdByEmail),
        })
        .onDuplicateKeyUpdate({
          set: { title: s.title, description: s.description, teamOrganisationId: orgId(s.teamSlug) },
        });
      const [studyRow] = await tx.select({ id: studies.id }).from(studies).where(eq(studies.slug, s.slug));
      if (!studyRow) throw new Error(`study "${s.slug}" is missing after the upsert`);
      const studyId = studyRow.id;

      const hash = await hashPlan(plan);
      const [v1] = await tx
        .select({ id: dataPlans.id, planHash: dataPlans.planHash })
        .from(dataPlans)
        .where(and(eq(dataPlans.studyId, studyId), eq(dataPlans.version, 1)));
      if (!v1) {
        await tx.insert(dataPlans).values({
          studyId,
          version: 1,
          plan,
          planHash: hash,
          note: s.planNote,
          createdById: userId(s.createdByEmail),
        });
        summary.plansAdded++;
      } else if (v1.planHash !== hash) {
        // the seed's plan changed: update version 1 only while no batch was checked against it
        const [used] = await tx
          .select({ id: batchVersions.id })
          .from(batchVersions)
          .where(eq(batchVersions.planId, v1.id))
          .limit(1);
        if (!used) await tx.update(dataPlans).set({ plan, planHash: hash }).where(eq(dataPlans.id, v1.id));
      }
      await tx
        .update(studies)
        .set({ currentPlanVersion: 1 })
        .where(and(eq(studies.id, studyId), isNull(studies.currentPlanVersion)));

      for (const email of s.analystEmails) {
        await tx
          .insert(studyAnalysts)
          .ignore()
          .values({ studyId, userId: userId(email) });
      }
      for (const slug of s.providerSlugs) {
        await tx
          .insert(studyProviders)
          .ignore()
          .values({ studyId, organisationId: orgId(slug) });
      }
    }
    summary.studies = DEMO_STUDIES.length;
  });
  return summary;
}

async function main(): Promise<void> {
  const url = databaseUrlOrExit();
  const pool = mysql.createPool({ uri: url, connectionLimit: 2, timezone: "Z" });
  const started = Date.now();
  try {
    const s = await seedDemo(drizzle(pool, { schema, mode: "planetscale" }));
    console.log(
      `seed: ${s.organisations} organisations, ${s.users} demo users (${s.usersAdded} new, ${s.passwordsReset} passwords restored), ` +
        `${s.studies} studies (${s.plansAdded} new plans) in ${redact(url)} (${Date.now() - started} ms)`,
    );
  } catch (err) {
    console.error(
      `seed failed: ${err instanceof Error && !("code" in err) ? err.message : describeDbError(err, url)}`,
    );
    process.exitCode = 1;
  } finally {
    await pool.end();
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  await main();
}
