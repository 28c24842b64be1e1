/**
 * Load-test accounts, made through the product's own services (run by scripts/load-server.sh
 * against the private `tributary_load` database, after the demo seed):
 * one open study with the barley demo plan, N provider organisations with one provider and a
 * personal API token each, N analysts assigned to the study with a token each, and (--leads N,
 * default 0) leads with a token each.
 *
 *   tsx --conditions=react-server scripts/load/setup.ts OUT.json [--providers N] [--analysts N] [--leads N]
 *
 * The services import "server-only", which only loads under the React server condition.
 * Organisations have no service of their own (the seed writes them too), so they are inserted here.
 */
import { randomBytes } from "node:crypto";
import { writeFileSync } from "node:fs";
import { eq, inArray } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { organisations, users } from "@/db/schema";
import { DEMO_STUDIES } from "@/lib/demo";
import type { Result } from "@/lib/result";
import { createApiToken } from "@/lib/people/commands-tokens";
import { createUser } from "@/lib/people/commands-users";
import { admitProvider, assignAnalyst, createStudy, publishPlanVersion } from "@/lib/studies";
import { LOAD_STUDY_SLUG, type LoadAccounts } from "./accounts";

function intArg(name: string, fallback: number, min = 1): number {
  const i = process.argv.indexOf(name);
  if (i < 0) return fallback;
  const n = Number(process.argv[i + 1]);
  if (!Number.isInteger(n) || n < min || n > 200)
    throw new Error(`${name} takes a whole number from ${min} to 200.`);
  return n;
}

function must<T>(what: string, r: Result<T>): T {
  if (!r.ok)
    throw new Error(`${what}: ${r.message}${r.fieldErrors ? ` ${JSON.stringify(r.fieldErrors)}` : ""}`);
  return r.data;
}

async function main(): Promise<void> {
  const out = process.argv[2];
  if (!out || out.startsWith("--"))
    throw new Error("usage: setup.ts OUT.json [--providers N] [--analysts N]");
  const nProviders = intArg("--providers", 20);
  const nAnalysts = intArg("--analysts", 20);
  const nLeads = intArg("--leads", 0, 0);
  const db = getDb();
  const [admin] = await db
    .select({ id: users.id })
    .from(users)
    .where(eq(users.email, "admin@tributary.test"));
  if (!admin) throw new Error("the demo admin is missing: run the demo seed (tsx db/seed.ts) first.");
  const barley = DEMO_STUDIES.find((s) => s.slug === "barley-nitrogen");
  if (!barley) throw new Error("the barley demo study is missing from lib/demo.");
  const password = `load-${randomBytes(12).toString("hex")}`;

  const study = must(
    "create the load study",
    await createStudy(admin.id, {
      slug: LOAD_STUDY_SLUG,
      title: "Load test: spring barley nitrogen response",
      description: "Invented batches sent by the load script (npm run load).",
      teamOrganisationId: null,
    }),
  );
  must(
    "publish the load study's data plan",
    await publishPlanVersion(admin.id, study.id, barley.plan, "the barley demo plan"),
  );

  const orgSlugs = Array.from(
    { length: nProviders },
    (_, i) => `load-farm-${String(i + 1).padStart(2, "0")}`,
  );
  await db
    .insert(organisations)
    .values(orgSlugs.map((slug, i) => ({ slug, name: `Load Farm ${i + 1}`, kind: "provider" as const })));
  const orgs = await db
    .select({ id: organisations.id, slug: organisations.slug })
    .from(organisations)
    .where(inArray(organisations.slug, orgSlugs));
  const orgId = (slug: string) => orgs.find((o) => o.slug === slug)?.id ?? NaN;

  const accounts: LoadAccounts = {
    studySlug: LOAD_STUDY_SLUG,
    providers: [],
    analysts: [],
    leads: [],
    password,
  };
  for (const [i, slug] of orgSlugs.entries()) {
    must(`admit ${slug}`, await admitProvider(admin.id, study.id, orgId(slug)));
    const email = `provider@${slug}.test`;
    const user = must(
      `create ${email}`,
      await createUser(admin.id, {
        email,
        name: `Provider ${i + 1}`,
        role: "provider",
        organisationId: orgId(slug),
        password,
      }),
    );
    const token = must(`token for ${email}`, await createApiToken(user.id, { name: "load test" }));
    accounts.providers.push({ email, organisation: slug, token: token.token });
  }
  for (let i = 0; i < nAnalysts; i++) {
    const email = `analyst${String(i + 1).padStart(2, "0")}@load.test`;
    const user = must(
      `create ${email}`,
      await createUser(admin.id, {
        email,
        name: `Load analyst ${i + 1}`,
        role: "analyst",
        organisationId: null,
        password,
      }),
    );
    must(`assign ${email}`, await assignAnalyst(admin.id, study.id, user.id));
    const token = must(`token for ${email}`, await createApiToken(user.id, { name: "load test" }));
    accounts.analysts.push({ email, token: token.token });
  }
  for (let i = 0; i < nLeads; i++) {
    const email = `lead${String(i + 1).padStart(2, "0")}@load.test`;
    const user = must(
      `create ${email}`,
      await createUser(admin.id, {
        email,
        name: `Load lead ${i + 1}`,
        role: "lead",
        organisationId: null,
        password,
      }),
    );
    const token = must(`token for ${email}`, await createApiToken(user.id, { name: "load test" }));
    accounts.leads.push({ email, token: token.token });
  }
  writeFileSync(out, JSON.stringify(accounts, null, 2), { mode: 0o600 });
  console.log(
    `[load-setup] study ${LOAD_STUDY_SLUG}: ${nProviders} providers, ${nAnalysts} analysts and ${nLeads} leads with API tokens`,
  );
}

try {
  await main();
} catch (e) {
  console.error(`[load-setup] ${e instanceof Error ? e.message : String(e)}`);
  process.exitCode = 1;
} finally {
  await getPool().end();
}
