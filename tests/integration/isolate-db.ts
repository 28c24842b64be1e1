/**
 * Vitest setupFile of the integration project: gives each test file its own copy of the run's
 * migrated and seeded database (made by global-setup.ts), so rows one file adds — studies,
 * assignments, deactivated users — never change what another file sees. Each file runs in its
 * own worker process, so setting DATABASE_URL here, before the test file is imported, points
 * getDb() at the copy. The copy is dropped when the file ends.
 */
import { randomBytes } from "node:crypto";
import mysql from "mysql2/promise";
import { afterAll, inject } from "vitest";

const baseUrl = inject("databaseUrl");
const baseName = inject("databaseName");
const name = `${baseName}_f${process.pid}${randomBytes(2).toString("hex")}`.slice(0, 64);
const fileUrl = baseUrl.replace(/\/[^/?]+(\?|$)/, `/${name}$1`);

const admin = await mysql.createConnection({ uri: baseUrl, multipleStatements: true });
try {
  await admin.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  await admin.query(`USE \`${name}\``);
  await admin.query(inject("databaseTemplateSql"));
} finally {
  await admin.end();
}

// a pool left by an earlier file in the same process would still point at the old database
const g = globalThis as unknown as { tributaryPool?: mysql.Pool };
if (g.tributaryPool) {
  await g.tributaryPool.end().catch(() => undefined);
  delete g.tributaryPool;
}
process.env.DATABASE_URL = fileUrl;

afterAll(async () => {
  await g.tributaryPool?.end().catch(() => undefined);
  delete g.tributaryPool;
  const c = await mysql.createConnection({ uri: baseUrl });
  try {
    await c.query(`DROP DATABASE IF EXISTS \`${name}\``);
  } finally {
    await c.end();
  }
});
