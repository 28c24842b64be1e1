/** The demo seed: what README.md "Using Tributary, role by role" promises, and nothing twice when run again. */
import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import path from "node:path";
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import { drizzle } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import * as schema from "@/db/schema";
import { runMigrations } from "@/db/migrate";
import { seedDemo, type SeedDb } from "@/db/seed";
import { canonicalJson, DEMO_PASSWORD, planHash } from "@/lib/demo";
import { parsePlan } from "@/lib/readiness";

const ROOT = path.resolve(import.meta.dirname, "../..");
const dbsh = (...args: string[]) =>
  execFileSync("bash", [path.join(ROOT, "scripts/db.sh"), ...args], {
    encoding: "utf8",
    stdio: ["ignore", "pipe", "pipe"],
  });

const NAME = `tributary_test_${process.pid}_seed`;
const TABLES = [
  "organisations",
  "users",
  "studies",
  "data_plans",
  "study_analysts",
  "study_providers",
] as const;
let pool: mysql.Pool;
let db: SeedDb;

async function counts(): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const t of TABLES) {
    const [rows] = await pool.query<mysql.RowDataPacket[]>(`SELECT COUNT(*) AS n FROM \`${t}\``);
    out[t] = Number(rows[0]?.n);
  }
  return out;
}

beforeAll(async () => {
  dbsh("drop-db", NAME);
  dbsh("create-db", NAME);
  const url = dbsh("url", NAME).trim();
  await runMigrations(url);
  pool = mysql.createPool({ uri: url, connectionLimit: 3, timezone: "Z" });
  db = drizzle(pool, { schema, mode: "planetscale" });
});

afterAll(async () => {
  await pool?.end();
  dbsh("drop-db", NAME);
});

describe("seedDemo", () => {
  test("first run writes the demo scenario; a second run adds nothing", async () => {
    await seedDemo(db);
    const first = await counts();
    // the demo (lib/demo/accounts.ts): 2 teams + 6 farms + 2 installers; 12 sign-ins (eight named accounts and a provider for each of the other four farms); 2 studies with plan version 1;
    // one analyst per study; six farms on barley, two installers on heat pumps
    expect(first).toEqual({
      organisations: 10,
      users: 12,
      studies: 2,
      data_plans: 2,
      study_analysts: 2,
      study_providers: 8,
    });
    const again = await seedDemo(db);
    expect(again.usersAdded).toBe(0);
    expect(again.plansAdded).toBe(0);
    expect(await counts()).toEqual(first);
  });

  test("each demo sign-in verifies with bcrypt (cost 10) and its role and organisation match", async () => {
    const rows = await pool.query<mysql.RowDataPacket[]>(
      "SELECT u.email, u.role, u.active, u.password_hash AS h, o.name AS org FROM users u JOIN organisations o ON o.id = u.organisation_id ORDER BY u.id",
    );
    const expected: [string, string, string, number][] = [
      ["admin@tributary.test", "admin", "Lowmoor Valley Crop Trials", 1],
      ["lead@lowmoor.test", "lead", "Lowmoor Valley Crop Trials", 1],
      ["analyst@lowmoor.test", "analyst", "Lowmoor Valley Crop Trials", 1],
      ["analyst2@lowmoor.test", "analyst", "Lowmoor Valley Crop Trials", 1],
      ["provider@harrowgate.test", "provider", "Harrowgate Farm", 1],
      ["provider@fennick.test", "provider", "Fennick Hill Farm", 1],
      ["installer@greenhearth.test", "provider", "Greenhearth Installers", 1],
      ["provider@brackenridge.test", "provider", "Brackenridge Farm", 1],
      ["provider@hollinsfold.test", "provider", "Hollinsfold Farm", 1],
      ["provider@saltmarsh.test", "provider", "Saltmarsh End Farm", 1],
      ["provider@coldwell.test", "provider", "Coldwell Farm", 1],
      ["inactive@harrowgate.test", "provider", "Harrowgate Farm", 0],
    ];
    expect(rows[0].map((r) => [r.email, r.role, r.org, Number(r.active)])).toEqual(expected);
    for (const r of rows[0]) {
      expect(r.h).toMatch(/^\$2[aby]\$10\$/);
      expect(await bcrypt.compare(DEMO_PASSWORD, r.h as string)).toBe(true);
      expect(await bcrypt.compare("tributary-demo ", r.h as string)).toBe(false);
    }
  });

  test("memberships: analysts and provider organisations per study", async () => {
    const [analysts] = await pool.query<mysql.RowDataPacket[]>(
      "SELECT s.slug, u.email FROM study_analysts sa JOIN studies s ON s.id = sa.study_id JOIN users u ON u.id = sa.user_id ORDER BY s.slug",
    );
    expect(analysts.map((r) => [r.slug, r.email])).toEqual([
      ["barley-nitrogen", "analyst@lowmoor.test"],
      ["heat-pump-savings", "analyst2@lowmoor.test"],
    ]);
    const [providers] = await pool.query<mysql.RowDataPacket[]>(
      "SELECT s.slug, o.slug AS org FROM study_providers sp JOIN studies s ON s.id = sp.study_id JOIN organisations o ON o.id = sp.organisation_id ORDER BY s.slug, o.slug",
    );
    expect(providers.map((r) => `${r.slug}:${r.org}`)).toEqual([
      "barley-nitrogen:brackenridge",
      "barley-nitrogen:coldwell",
      "barley-nitrogen:fennick-hill",
      "barley-nitrogen:harrowgate",
      "barley-nitrogen:hollinsfold",
      "barley-nitrogen:saltmarsh-end",
      "heat-pump-savings:greenhearth",
      "heat-pump-savings:tarnbrook-heating",
    ]);
  });

  test("stored plans parse, are current, and carry the sha-256 of their canonical JSON", async () => {
    const rows = await db
      .select({
        slug: schema.studies.slug,
        current: schema.studies.currentPlanVersion,
        version: schema.dataPlans.version,
        plan: schema.dataPlans.plan,
        hash: schema.dataPlans.planHash,
      })
      .from(schema.dataPlans)
      .innerJoin(schema.studies, eq(schema.studies.id, schema.dataPlans.studyId))
      .orderBy(schema.studies.slug);
    expect(rows.map((r) => [r.slug, r.current, r.version])).toEqual([
      ["barley-nitrogen", 1, 1],
      ["heat-pump-savings", 1, 1],
    ]);
    const barley = parsePlan(rows[0]?.plan);
    const heat = parsePlan(rows[1]?.plan);
    if (!barley.ok || !heat.ok) throw new Error("a stored plan does not parse");
    for (const r of rows) {
      // independent of planHash(): node's sha-256 over the canonical text
      expect(r.hash).toBe(createHash("sha256").update(canonicalJson(r.plan)).digest("hex"));
      expect(r.hash).toBe(planHash(r.plan));
    }
    expect(barley.plan.columns.find((c) => c.role === "response")?.name).toBe("yield_t_ha");
    expect(barley.plan.columns.find((c) => c.name === "soil")).toMatchObject({
      levels: ["loam", "clay", "sand", "silt"],
      baseline: "loam",
    });
    expect(barley.plan.columns.find((c) => c.name === "nitrogen_kg_ha")).toMatchObject({
      type: "number",
      min: 0,
      max: 250,
    });
    expect(barley.plan.columns.find((c) => c.name === "variety")?.levels).toHaveLength(4);
    expect(barley.plan.anticipatedR2).toBe(0.35);
    expect(barley.plan.thresholds.dfTarget).toBeGreaterThan(0);
    expect(heat.plan.columns.find((c) => c.role === "response")?.name).toBe("annual_kwh_saved");
    expect(heat.plan.thresholds).toMatchObject({ perParameter: 15, missingBlocker: 0.3, sparseLevel: 8 });
  });

  test("a re-run restores a changed demo password and ends the account's older sessions", async () => {
    const email = "provider@fennick.test";
    await pool.query("UPDATE users SET password_hash = ?, active = 0 WHERE email = ?", [
      await bcrypt.hash("something-else", 4),
      email,
    ]);
    const [[before]] = await pool.query<mysql.RowDataPacket[]>(
      "SELECT session_version AS sv FROM users WHERE email = ?",
      [email],
    );
    const summary = await seedDemo(db);
    expect(summary.passwordsReset).toBe(1);
    const [[after]] = await pool.query<mysql.RowDataPacket[]>(
      "SELECT session_version AS sv, active, password_hash AS h FROM users WHERE email = ?",
      [email],
    );
    expect(await bcrypt.compare(DEMO_PASSWORD, after?.h as string)).toBe(true);
    expect(Number(after?.active)).toBe(1);
    expect(Number(after?.sv)).toBe(Number(before?.sv) + 1);
  });
});

describe("canonicalJson", () => {
  test("key order does not change the text; array order does", () => {
    expect(canonicalJson({ b: 1, a: { d: [2, 1], c: null } })).toBe('{"a":{"c":null,"d":[2,1]},"b":1}');
    expect(planHash({ a: 1, b: 2 })).toBe(planHash({ b: 2, a: 1 }));
    expect(planHash({ a: [1, 2] })).not.toBe(planHash({ a: [2, 1] }));
    // FIPS 180-2 test vector: sha-256("abc"); canonicalJson of the string "abc" is "\"abc\""
    expect(createHash("sha256").update("abc").digest("hex")).toBe(
      "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad",
    );
  });
});
