/**
 * One mysql2 pool and Drizzle client, reused across dev reloads; with DATABASE_REPLICA_URL, a
 * second client for the reads a replica may serve (`getReadDb`: the board, the pool, reports).
 */
import { drizzle } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import * as schema from "./schema";
import { ReplicaRouter, type ReplicaState } from "./replica";
import { env } from "@/lib/env";

const globalForDb = globalThis as unknown as {
  tributaryPool?: mysql.Pool;
  tributaryReplicaPool?: mysql.Pool;
  tributaryReplicaRouter?: ReplicaRouter;
};

const poolOptions = { connectionLimit: 10, timezone: "Z", dateStrings: false } as const;

export function getPool(): mysql.Pool {
  if (!globalForDb.tributaryPool) {
    const pool = mysql.createPool({ uri: env().DATABASE_URL, ...poolOptions });
    // whoever ends the pool (the worker, the tests) ends the replica's too, so the process can exit
    const end = pool.end.bind(pool);
    pool.end = async () => {
      await globalForDb.tributaryReplicaPool?.end().catch(() => undefined);
      globalForDb.tributaryReplicaPool = undefined;
      globalForDb.tributaryReplicaRouter = undefined;
      readDbInstance = undefined;
      return end();
    };
    globalForDb.tributaryPool = pool;
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
let readDbInstance: Db | undefined;

export function getDb(): Db {
  dbInstance ??= makeDb();
  return dbInstance;
}

function replicaRouter(): ReplicaRouter | null {
  const { DATABASE_REPLICA_URL: url, DATABASE_REPLICA_MAX_LAG_S: maxLag } = env();
  if (!url) return null;
  if (!globalForDb.tributaryReplicaRouter) {
    // a replica that does not answer is given up on quickly: the primary answers instead
    const replica = mysql.createPool({ uri: url, ...poolOptions, connectTimeout: 2000 });
    globalForDb.tributaryReplicaPool = replica;
    globalForDb.tributaryReplicaRouter = new ReplicaRouter(getPool(), replica, maxLag, (l) => console.log(l));
  }
  return globalForDb.tributaryReplicaRouter;
}

/**
 * The client for reads that may be a moment old — the board, the pool, stored reports: the read
 * replica (DATABASE_REPLICA_URL) while it replicates and is at most DATABASE_REPLICA_MAX_LAG_S
 * behind, else the primary. Without a replica, the same client as getDb(). Never for writes,
 * the job queue, sign-in or anything read just to be written back (use getDb()).
 */
export function getReadDb(): Db {
  const router = replicaRouter();
  if (!router) return getDb();
  readDbInstance ??= drizzle(router.client() as unknown as mysql.Pool, {
    schema,
    mode: "planetscale",
  }) as unknown as Db;
  return readDbInstance;
}

/** Where reads go and how far behind the replica is (null without DATABASE_REPLICA_URL). */
export function replicaStatus(): ReplicaState | null {
  return replicaRouter()?.status() ?? null;
}

export { schema };
