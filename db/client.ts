/** One mysql2 pool and Drizzle client, reused across dev reloads. */
import { drizzle } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import * as schema from "./schema";
import { env } from "@/lib/env";

const globalForDb = globalThis as unknown as { tributaryPool?: mysql.Pool };

export function getPool(): mysql.Pool {
  if (!globalForDb.tributaryPool) {
    globalForDb.tributaryPool = mysql.createPool({
      uri: env().DATABASE_URL,
      connectionLimit: 10,
      timezone: "Z",
      dateStrings: false,
    });
  }
  return globalForDb.tributaryPool;
}

function makeDb() {
  return drizzle(getPool(), { schema, mode: "planetscale" });
}

export type Db = ReturnType<typeof makeDb>;
/** The one transaction type: what `getDb().transaction(async (tx) => …)` hands its callback. */
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];
/** A transaction or the client itself, for helpers that work inside or outside one. */
export type DbOrTx = Db | Tx;
let dbInstance: Db | undefined;

export function getDb(): Db {
  dbInstance ??= makeDb();
  return dbInstance;
}

export { schema };
