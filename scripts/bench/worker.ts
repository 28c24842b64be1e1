/**
 * The server worker's figure for `npm run bench -- --worker`: how long the check worker takes
 * for one batch from the start of its download to the stored report. A private stack of its
 * own: a scratch database `tributary_bench_<pid>` on the project's MariaDB (scripts/db.sh;
 * migrated and seeded, dropped at the end) and the upload-service fake on a free loopback port.
 * The benchmark plan is published on the demo barley study, the demo provider records the
 * benchmark file (at --rows rows) as a new batch, and the worker's own runJob takes the claimed
 * job: signed URL, download from the fake, check, report and states stored in one transaction.
 * The time is runJob's, from its call to its return; the upload before it is not counted. The
 * check threads are started first, as the worker process starts them when it starts.
 * Prints one JSON line {ms, rows, runs, what}. Run through the services' React server condition:
 *
 *   npx tsx --conditions=react-server scripts/bench/worker.ts [--rows 200000] [--rounds 3]
 */
import { execFileSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, mkdtempSync, readFileSync, renameSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { parseArgs } from "node:util";
import { warmCheckThreads } from "@/lib/readiness/node-stream";
import { GENERATOR_VERSION, generate, plan } from "./generate";
import { median } from "./measure";

const { values: opt } = parseArgs({
  options: { rows: { type: "string", default: "200000" }, rounds: { type: "string", default: "3" } },
});
const ROWS = Number(opt.rows);
const ROUNDS = Number(opt.rounds);
const ROOT = path.resolve(import.meta.dirname, "../..");
const db = (...args: string[]) =>
  execFileSync("bash", [path.join(ROOT, "scripts/db.sh"), ...args], {
    cwd: ROOT,
    encoding: "utf8",
    stdio: ["ignore", "pipe", "inherit"],
  });
const log = (line: string) => process.stderr.write(`[bench worker] ${line}\n`);

async function main() {
  const csv = path.join(ROOT, "bench-out", `providers-v${GENERATOR_VERSION}-${ROWS}.csv`);
  if (!existsSync(csv)) {
    mkdirSync(path.dirname(csv), { recursive: true });
    await generate(`${csv}.part`, ROWS);
    renameSync(`${csv}.part`, csv);
  }
  // as the worker process does at its start (scripts/worker.ts): its check threads load the engine
  // before the first job, here while the scratch database is made
  await warmCheckThreads();
  db("start");
  const name = `tributary_bench_${process.pid}`;
  db("drop-db", name);
  db("create-db", name);
  const url = db("url", name).trim();
  const dir = mkdtempSync(path.join(os.tmpdir(), "tributary-bench-uploads-"));
  const apiKey = `sk_bench_${randomBytes(8).toString("hex")}`;
  const appId = "tributary-bench";
  const token = Buffer.from(JSON.stringify({ apiKey, appId, regions: ["local1"] })).toString("base64");
  process.env.DATABASE_URL = url;
  process.env.NEXTAUTH_SECRET ??= "bench-only-secret-not-for-production-0000";
  process.env.UPLOADTHING_TOKEN = token;
  const closers: (() => Promise<unknown>)[] = [];
  try {
    const { runMigrations } = await import("@/db/migrate");
    await runMigrations(url);
    const { getDb, getPool } = await import("@/db/client");
    closers.push(() => getPool().end());
    const dbc = getDb();
    const { seedDemo } = await import("@/db/seed");
    await seedDemo(dbc);
    const { startUploadFake } = await import("@/fakes/upload-service");
    const fake = await startUploadFake({ port: 0, apiKey, appId, dir, log: () => {} });
    closers.push(() => fake.close());
    const { createUtapi, openStoredFile } = await import("@/lib/batches/intake/file-store");
    const api = createUtapi({ token, apiUrl: fake.url, ingestUrl: fake.url });
    const { UTFile } = await import("uploadthing/server");
    const { eq } = await import("drizzle-orm");
    const { studies, users } = await import("@/db/schema");
    const idOf = async (email: string) =>
      (await dbc.select({ id: users.id }).from(users).where(eq(users.email, email)))[0]!.id;
    const [study] = await dbc
      .select({ id: studies.id })
      .from(studies)
      .where(eq(studies.slug, "barley-nitrogen"));
    const { publishPlanVersion } = await import("@/lib/studies");
    const published = await publishPlanVersion(
      await idOf("admin@tributary.test"),
      study!.id,
      plan,
      "the benchmark plan",
    );
    if (!published.ok) throw new Error(`publishing the benchmark plan: ${published.message}`);
    const provider = await idOf("provider@harrowgate.test");
    const { recordBatchVersion } = await import("@/lib/batches/commands-upload");
    const { claimJob } = await import("@/lib/batches/jobs/check-jobs");
    const { runJob } = await import("@/lib/batches/jobs/worker");
    const bytes = readFileSync(csv);
    const runs: number[] = [];
    for (let round = 1; round <= ROUNDS; round++) {
      const fileName = `bench-${ROWS}-${round}.csv`;
      const stored = await api.uploadFiles(new UTFile([bytes], fileName, { type: "text/csv" }), {
        acl: "private",
        contentDisposition: "attachment",
      });
      if (stored.error || !stored.data) throw new Error(`uploading to the fake: ${String(stored.error)}`);
      const rec = await recordBatchVersion(
        provider,
        { studyId: study!.id, batchPublicId: null },
        { key: stored.data.key, url: stored.data.ufsUrl, name: fileName, size: bytes.length },
      );
      if (!rec.ok) throw new Error(`recording the batch: ${rec.message}`);
      const job = await claimJob(dbc, "bench-worker");
      if (!job || job.batchVersionId !== rec.data.batchVersionId)
        throw new Error("the benchmark batch's check job was not claimed");
      const lines: string[] = [];
      const t0 = performance.now();
      const report = await runJob(
        { db: dbc, openFile: (k) => openStoredFile(k, { api }), log: (l) => lines.push(l) },
        job,
      );
      const ms = performance.now() - t0;
      if (!report || !lines.some((l) => l.includes("report stored")))
        throw new Error(`the report was not stored: ${lines.join(" / ")}`);
      runs.push(ms);
      log(
        `round ${round}: ${(ms / 1000).toFixed(2)} s, ${report.rows.total.toLocaleString("en")} rows, ${report.counts.blocker} blockers`,
      );
    }
    const what = `runJob from its call to the stored report (signed URL, download from the upload fake on loopback, check, one transaction in a scratch MariaDB database); median of ${ROUNDS}`;
    process.stdout.write(`${JSON.stringify({ ms: median(runs), rows: ROWS, runs, what })}\n`);
  } finally {
    for (const close of closers.reverse()) await close().catch(() => undefined);
    rmSync(dir, { recursive: true, force: true });
    db("drop-db", name);
  }
}

main().then(
  () => process.exit(0),
  (e) => {
    console.error(e);
    process.exit(2);
  },
);
