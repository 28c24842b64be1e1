/**
 * Vitest globalSetup of the integration project: starts the project's MariaDB (it stays up),
 * gives this run its own database `tributary_test_<pid>`, migrates and seeds it, and points
 * DATABASE_URL at it, so getDb() in test files never touches the demo database `tributary`.
 * Test files can also read the URL with `inject("databaseUrl")`.
 */
import { execFileSync } from "node:child_process";
import path from "node:path";
import mysql from "mysql2/promise";
import { drizzle } from "drizzle-orm/mysql2";
import type { TestProject } from "vitest/node";
import * as schema from "@/db/schema";
import { describeDbError, runMigrations } from "@/db/migrate";
import { seedDemo } from "@/db/seed";

declare module "vitest" {
  export interface ProvidedContext {
    databaseUrl: string;
    databaseName: string;
    /** schema and seed rows of the run's database as SQL; isolate-db.ts copies it per test file */
    databaseTemplateSql: string;
  }
}

const ROOT = path.resolve(import.meta.dirname, "../..");
const DB_SCRIPT = path.join(ROOT, "scripts/db.sh");

/** Defaults for the variables of lib/env.ts; the test ports of DEVELOPERS.md "Ports (loopback only)". */
const TEST_ENV: Record<string, string> = {
  APP_URL: "http://127.0.0.1:3410",
  NEXTAUTH_URL: "http://127.0.0.1:3410",
  NEXTAUTH_SECRET: "test-secret-not-for-production-0123456789",
  UPLOADTHING_TOKEN: Buffer.from(
    JSON.stringify({
      apiKey: "sk_dev_tributary_local_0000000000",
      appId: "tributary-dev",
      regions: ["local1"],
    }),
  ).toString("base64"),
  UPLOADTHING_INGEST_URL: "http://127.0.0.1:3411",
  UPLOADTHING_API_URL: "http://127.0.0.1:3411",
  UPLOADTHING_CALLBACK_URL: "http://127.0.0.1:3410/api/uploadthing",
  SMTP_URL: "smtp://127.0.0.1:3412",
  MAIL_FROM: "Tributary <no-reply@tributary.test>",
  MAILBOX_URL: "http://127.0.0.1:3413",
  FAKE_UPLOAD_PORT: "3411",
  FAKE_SMTP_PORT: "3412",
  FAKE_MAILBOX_PORT: "3413",
  MAX_UPLOAD_MB: "200",
  TRIBUTARY_DEMO: "1",
};

function db(...args: string[]): string {
  return execFileSync("bash", [DB_SCRIPT, ...args], {
    cwd: ROOT,
    encoding: "utf8",
    stdio: ["ignore", "pipe", "inherit"],
  });
}

/** Drops test databases left by runs that died before their teardown (their pid is gone). */
function dropOrphans(): void {
  const out = db("sql", "--skip-column-names", "-e", "SHOW DATABASES LIKE 'tributary\\_test\\_%'");
  for (const name of out
    .split("\n")
    .map((s) => s.trim())
    .filter(Boolean)) {
    const pid = Number(/^tributary_test_(\d+)/.exec(name)?.[1]);
    if (!Number.isInteger(pid) || pid === process.pid) continue;
    let alive = true;
    try {
      process.kill(pid, 0);
    } catch {
      alive = false;
    }
    if (!alive) db("drop-db", name);
  }
}

export default async function setup(project: TestProject): Promise<() => void> {
  db("start");
  dropOrphans();
  const name = `tributary_test_${process.pid}`;
  db("drop-db", name);
  db("create-db", name);
  const url = db("url", name).trim();

  try {
    await runMigrations(url);
    const pool = mysql.createPool({ uri: url, connectionLimit: 2, timezone: "Z" });
    try {
      await seedDemo(drizzle(pool, { schema, mode: "planetscale" }));
    } finally {
      await pool.end();
    }
  } catch (err) {
    db("drop-db", name);
    throw new Error(`preparing the test database failed: ${describeDbError(err, url)}`);
  }

  // the workers are started after this and inherit the environment
  for (const [k, v] of Object.entries(TEST_ENV)) process.env[k] ??= v;
  process.env.DATABASE_URL = url;
  project.provide("databaseUrl", url);
  project.provide("databaseName", name);
  project.provide("databaseTemplateSql", db("dump", name));

  return () => {
    if (process.env.KEEP_TEST_DB === "1") {
      console.log(`kept test database ${name}`);
      return;
    }
    // the run's database and the per-file copies of files that did not finish
    const out = db(
      "sql",
      "--skip-column-names",
      "-e",
      `SHOW DATABASES LIKE '${name.replace(/_/g, "\\_")}\\_%'`,
    );
    for (const n of out
      .split("\n")
      .map((s) => s.trim())
      .filter(Boolean))
      db("drop-db", n);
    db("drop-db", name);
  };
}
