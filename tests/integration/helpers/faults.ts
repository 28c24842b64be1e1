/**
 * Processes for the fault tests: real worker processes (scripts/worker.ts) that can be
 * stopped gracefully or killed, a private second MariaDB instance that can be stopped and
 * started without touching the shared one, and the database reads the assertions need.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import path from "node:path";
import mysql from "mysql2/promise";
import { drizzle } from "drizzle-orm/mysql2";
import { and, eq, inArray, sql } from "drizzle-orm";
import * as schema from "@/db/schema";
import type { Db } from "@/db/client";
import { auditEvents, batchVersions, checkJobs, emailOutbox, reports } from "@/db/schema";
import { PROCESS_PATIENCE_MS } from "../../helpers/processes";

export const ROOT = path.resolve(import.meta.dirname, "../../..");

/** A Drizzle client with its own small pool (so a test can close it before stopping a server). */
export function openDb(url: string): { db: Db; pool: mysql.Pool } {
  const pool = mysql.createPool({ uri: url, connectionLimit: 3, timezone: "Z" });
  return { db: drizzle(pool, { schema, mode: "planetscale" }) as unknown as Db, pool };
}

export type WorkerProcess = {
  pid: number;
  /** every line the worker printed so far */
  lines: string[];
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  alive(): boolean;
  /** resolves with the first line matching `re` (also one already printed) */
  waitForLine(re: RegExp, timeoutMs?: number): Promise<string>;
  kill(signal: NodeJS.Signals): void;
};

const started = new Set<ChildProcess>();

/**
 * Starts scripts/worker.ts as its own Node process (node --import tsx, so the pid is
 * the worker itself and SIGKILL kills the worker, not a launcher). `env` is added to the
 * test's environment; SMTP points at a closed port so no test mail reaches a shared fake.
 */
export function startWorker(env: Record<string, string>): WorkerProcess {
  const child = spawn(process.execPath, ["--import", "tsx", "scripts/worker.ts"], {
    cwd: ROOT,
    env: { ...process.env, SMTP_URL: "smtp://127.0.0.1:9", TRIBUTARY_WORKER_POLL_MS: "200", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  started.add(child);
  const lines: string[] = [];
  const waiters: { re: RegExp; resolve: (l: string) => void }[] = [];
  const onData = (buf: Buffer) => {
    for (const line of buf.toString("utf8").split("\n").filter(Boolean)) {
      lines.push(line);
      if (process.env.FAULTS_DEBUG) console.log(`[${child.pid}] ${line}`);
      for (const w of [...waiters]) {
        if (w.re.test(line)) {
          waiters.splice(waiters.indexOf(w), 1);
          w.resolve(line);
        }
      }
    }
  };
  child.stdout!.on("data", onData);
  child.stderr!.on("data", onData);
  let done = false;
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) =>
    child.on("exit", (code, signal) => {
      done = true;
      started.delete(child);
      resolve({ code, signal });
    }),
  );
  return {
    pid: child.pid!,
    lines,
    exited,
    alive: () => !done,
    kill: (signal) => void child.kill(signal),
    waitForLine(re, timeoutMs = PROCESS_PATIENCE_MS) {
      const seen = lines.find((l) => re.test(l));
      if (seen) return Promise.resolve(seen);
      return new Promise((resolve, reject) => {
        const t = setTimeout(
          () =>
            reject(
              new Error(
                `worker ${child.pid} printed no line matching ${re} within ${timeoutMs} ms; it printed:\n${lines.join("\n")}`,
              ),
            ),
          timeoutMs,
        );
        waiters.push({ re, resolve: (l) => (clearTimeout(t), resolve(l)) });
      });
    },
  };
}

/** Kills every worker process this file started that is still running (for afterAll). */
export async function killAllWorkers(): Promise<void> {
  const left = [...started];
  for (const c of left) c.kill("SIGKILL");
  await Promise.all(
    left.map(
      (c) => new Promise((r) => (c.exitCode !== null || c.signalCode !== null ? r(null) : c.once("exit", r))),
    ),
  );
}

/** Polls `fn` until it returns a truthy value; throws `what` after `timeoutMs`. */
export async function waitFor<T>(
  what: string,
  fn: () => Promise<T | null | undefined | false>,
  timeoutMs = PROCESS_PATIENCE_MS,
  everyMs = 100,
): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() > until) throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}

/** The private MariaDB instance of the fault tests: own data directory and port, never the shared 3406. */
export const PRIVATE_DB = {
  home: path.join(ROOT, ".data/faults-db"),
  port: Number(process.env.TRIBUTARY_FAULTS_DB_PORT ?? 3416),
};

/** Runs scripts/db.sh against the private instance; throws with its output when it fails. */
export function privateDb(...args: string[]): string {
  const r = spawnSync("bash", [path.join(ROOT, "scripts/db.sh"), ...args], {
    cwd: ROOT,
    env: { ...process.env, TRIBUTARY_DB_HOME: PRIVATE_DB.home, TRIBUTARY_DB_PORT: String(PRIVATE_DB.port) },
    encoding: "utf8",
    timeout: PROCESS_PATIENCE_MS,
  });
  if (r.status !== 0)
    throw new Error(
      `db.sh ${args.join(" ")} (private instance on ${PRIVATE_DB.port}) failed:\n${r.stdout}${r.stderr}`,
    );
  return r.stdout;
}

/** Loads the run's seeded template (schema and demo rows) into a fresh database at `url`, with an empty outbox. */
export async function loadTemplate(url: string, templateSql: string): Promise<void> {
  const c = await mysql.createConnection({ uri: url, multipleStatements: true });
  try {
    await c.query(templateSql);
    await c.query("DELETE FROM email_outbox");
  } finally {
    await c.end();
  }
}

/** Empties the outbox of a database, so a worker started by a test sends no mail anywhere. */
export async function clearOutbox(db: Db): Promise<void> {
  await db.delete(emailOutbox);
}

/** What the database holds for some batch versions: reports, jobs, states and audit rows. */
export async function outcome(db: Db, versionIds: number[]) {
  const rs = await db
    .select({
      id: reports.id,
      v: reports.batchVersionId,
      status: reports.status,
      rows: sql<number>`JSON_EXTRACT(${reports.report}, '$.rows.total')`,
    })
    .from(reports)
    .where(inArray(reports.batchVersionId, versionIds));
  const jobs = await db.select().from(checkJobs).where(inArray(checkJobs.batchVersionId, versionIds));
  const versions = await db
    .select({ id: batchVersions.id, state: batchVersions.state })
    .from(batchVersions)
    .where(inArray(batchVersions.id, versionIds));
  const audit = await db
    .select({ action: auditEvents.action, objectId: auditEvents.objectId })
    .from(auditEvents)
    .where(
      and(eq(auditEvents.objectType, "batch_version"), inArray(auditEvents.objectId, versionIds.map(String))),
    );
  const per = (id: number) => ({
    reports: rs.filter((r) => r.v === id),
    jobs: jobs.filter((j) => j.batchVersionId === id),
    state: versions.find((v) => v.id === id)?.state,
    audit: audit
      .filter((a) => a.objectId === String(id))
      .map((a) => a.action)
      .sort(),
  });
  return new Map(versionIds.map((id) => [id, per(id)]));
}
