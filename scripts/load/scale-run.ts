/**
 * `npm run load -- --scale`: the scale topology of scripts/load/scale-stack.ts under a network's
 * volume, with four faults on a schedule, then the after-run checks. `--batches` providers each
 * upload one batch of `--rows` rows, `--wave` at a time, through HAProxy; `--analysts` poll
 * their queue and open reports and the pool, `--leads` read the board, each at `--rate`
 * requests a second; the analysts' decisions are made as the reports arrive. Faults: app-a
 * killed (SIGKILL) during wave 3, worker-1 killed mid-check during wave 5, the replica stopped
 * for 20 s from wave 6, the primary restarted during wave 8. Bounded: every upload is one request
 * (180 s), the checks get --check-limit s, the whole run --timeout s.
 */
import { spawn } from "node:child_process";
import { readFileSync, writeFileSync, mkdirSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import type { LoadAccounts } from "./accounts";
import { loadBatch } from "./batches";
import { progressReader } from "./progress";
import { afterChecks, openServer, sampleLag, selects } from "./scale-checks";
import { until, warmRoutes } from "./scale-parts";
import { ENDPOINTS, printScale, type FaultNote } from "./scale-report";
import { SCALE, startScaleStack, type ScaleStack } from "./scale-stack";
import { ScaleRecorder, signInLimit, startReaders, upload, type UploadOutcome } from "./scale-traffic";
import { watchOwnLoop } from "./loop";

const ROOT = path.resolve(import.meta.dirname, "../..");
const log = (l: string) => console.log(`[scale] ${l}`);

function opt(argv: string[], name: string, fallback: number, min: number, max: number): number {
  const i = argv.indexOf(`--${name}`);
  if (i < 0) return fallback;
  const v = Number(argv[i + 1]);
  if (!Number.isFinite(v) || v < min || v > max)
    throw new Error(`--${name} takes a number from ${min} to ${max}.`);
  return v;
}

export async function runScale(argv: string[]): Promise<number> {
  const s = {
    batches: opt(argv, "batches", 100, 10, 200),
    rows: opt(argv, "rows", 50_000, 100, 1_000_000),
    wave: opt(argv, "wave", 10, 1, 100),
    analysts: opt(argv, "analysts", 100, 1, 200),
    leads: opt(argv, "leads", 5, 1, 20),
    rate: opt(argv, "rate", 0.2, 0.05, 10),
    checkLimit: opt(argv, "check-limit", 900, 30, 3600),
    timeout: opt(argv, "timeout", 2700, 120, 7200),
  };
  const hard = setTimeout(() => {
    console.error(`load --scale: FAILED: the run exceeded its hard limit of ${s.timeout} s`);
    void stack?.stop().finally(() => process.exit(1));
  }, s.timeout * 1000);
  const loadBefore = os
    .loadavg()
    .map((x) => x.toFixed(2))
    .join(" ");
  let stack: ScaleStack | null = null;
  try {
    stack = await startScaleStack(ROOT, { providers: s.batches, analysts: s.analysts, leads: s.leads }, log);
    return await measure(stack, s, loadBefore);
  } finally {
    clearTimeout(hard);
    log("stopping the scale stack");
    await stack?.stop();
  }
}

async function measure(stack: ScaleStack, s: Record<string, number>, loadBefore: string): Promise<number> {
  const accounts = JSON.parse(readFileSync(stack.accountsFile, "utf8")) as LoadAccounts;
  const origin = stack.origin;
  log(`building ${s.batches} batches of ${s.rows!.toLocaleString("en")} rows`);
  const bodies = accounts.providers.map((p, k) => loadBatch(k, s.rows!, p.token, accounts.studySlug));
  log(`each ≈ ${(bodies[0]!.csvBytes / 1e6).toFixed(2)} MB`);
  const primary = openServer(stack.env.DATABASE_URL!);
  const replica = openServer(stack.env.DATABASE_REPLICA_URL!);
  const rec = new ScaleRecorder();
  const faults: FaultNote[] = [];
  const note = (name: string, what: string) => (
    faults.push({ name, at: Date.now(), what }),
    log(`${name}: ${what}`)
  );

  const signIn = await signInLimit(origin, rec, accounts.analysts[0]!.email, accounts.password, 10);
  log(
    `sign-in limit: ${JSON.stringify(signIn.instances)} answered the failures; refused after: ${signIn.refusedAfter}`,
  );
  const decider = spawn(
    path.join(ROOT, "node_modules/.bin/tsx"),
    ["--conditions=react-server", "scripts/load/scale-decide.ts", stack.accountsFile],
    {
      cwd: ROOT,
      env: stack.env,
      stdio: ["pipe", "pipe", "inherit"],
    },
  );
  let decided = 0;
  decider.stdout.on("data", (d: Buffer) => (decided += (d.toString().match(/"ok":true/g) ?? []).length));
  // the decider's own start-up (tsx, the services) takes a core for a second or two: it is the
  // harness, not the app's load, so it is done before the readers start and the window opens
  await new Promise<void>((resolve, reject) => {
    const ready = (d: Buffer) => {
      if (!d.toString().includes('"ready":true')) return;
      decider.stdout.off("data", ready);
      resolve();
    };
    decider.stdout.on("data", ready);
    decider.once("exit", (code) => reject(new Error(`the decider exited (${code}) before it was ready`)));
  });
  const lag = sampleLag(primary, replica);
  const ownSeconds: [number, number][] = [];
  const ownLoop = watchOwnLoop(ownSeconds);
  const readers = startReaders(
    origin,
    accounts.studySlug,
    accounts.analysts.slice(1).map((a) => a.token),
    accounts.leads.map((l) => l.token),
    rec,
    s.rate!,
  );
  // one round of every reader before the first wave, so the window opens on the full read load
  await new Promise((r) => setTimeout(r, 1000 / s.rate!));
  const startedAt = Date.now();
  const outcomes: UploadOutcome[] = [];
  const side: Promise<void>[] = [];
  const selectsAt = async () => ({ primary: await selects(primary), replica: await selects(replica) });

  const waves = Math.ceil(s.batches! / s.wave!);
  for (let w = 0; w < waves; w++) {
    const ks = Array.from({ length: Math.min(s.wave!, s.batches! - w * s.wave!) }, (_, i) => w * s.wave! + i);
    log(`wave ${w + 1}/${waves}: ${ks.length} uploads`);
    const sent = Promise.all(ks.map((k) => upload(origin, rec, k, bodies[k]!)));
    // one fault at a time: the next one waits until the last has played out
    const fault = (run: () => Promise<void>) => {
      const earlier = Promise.all(side);
      side.push(earlier.then(run));
    };
    if (w === 2) fault(() => killApp(stack, note));
    if (w === 4) fault(() => killWorker(stack, primary, note));
    if (w === 5) fault(() => stopReplica(stack, note, selectsAt));
    if (w === 7) fault(() => restartPrimary(stack, note));
    outcomes.push(...(await sent));
  }
  const accepted = outcomes.filter((o) => o.status === 201);
  const lastAccepted = Math.max(...accepted.map((o) => o.acceptedAt ?? 0));
  log(
    `${accepted.length}/${outcomes.length} uploads accepted; waiting for the checks, decisions and e-mails`,
  );
  await Promise.all(side);
  const progress = progressReader(stack.env.DATABASE_URL!, accounts.studySlug);
  let p = await progress.read();
  await until(
    "every batch reported and decided, every e-mail sent",
    async () => {
      p = await progress.read();
      const [[o]] = (await primary.query(
        "select count(*) as n, sum(status = 'sent') as sent from email_outbox",
      )) as unknown as [{ n: number; sent: number }[]];
      // decided: no version left ready for review; every decision's e-mail out
      return (
        p.versions >= accepted.length &&
        p.waiting === 0 &&
        p.reported >= p.versions &&
        p.ready === 0 &&
        Number(o?.sent) >= Number(o?.n)
      );
    },
    s.checkLimit! * 1000,
  ).catch((e: Error) => log(`FAILED: ${e.message}`));
  const doneAt = Date.now();
  const generatorMaxMs = ownLoop();
  await readers.stop();
  decider.stdin.end();
  await lag.stop();
  await progress.close();
  const after = await afterChecks(primary, accounts.studySlug, stack.env.MAILBOX_URL!);
  const loadAfter = os
    .loadavg()
    .map((x) => x.toFixed(2))
    .join(" ");
  const figures = printScale({
    settings: s,
    rec,
    outcomes,
    faults,
    after,
    lag: lag.samples,
    signIn,
    reportsOpened: readers.reportsOpened(),
    decided,
    windowS: (doneAt - startedAt) / 1000,
    uploadsS: (lastAccepted - startedAt) / 1000,
    lastReportAt: p.lastReportAt,
    startedAt,
    checksS:
      p.firstUploadAt && p.lastReportAt
        ? (p.lastReportAt.getTime() - p.firstUploadAt.getTime()) / 1000
        : null,
    machine: `${os.cpus().length} cores; load average (1/5/15 min) ${loadBefore} before, ${loadAfter} after; load generator's longest stall ${generatorMaxMs} ms`,
  });
  await primary.end();
  await replica.end();
  const dir = path.join(ROOT, ".data", "load");
  mkdirSync(dir, { recursive: true });
  writeFileSync(path.join(dir, "scale-last.json"), JSON.stringify(figures, null, 2));
  // every answer with its time, beside the faults' times: where the slow ones fell
  writeFileSync(
    path.join(dir, "scale-requests.json"),
    JSON.stringify({
      startedAt,
      faults,
      generatorLoop: ownSeconds,
      // per instance and endpoint: [ms after startedAt when answered, latency ms, status]
      answers: Object.fromEntries(
        [...rec.byInstance].map(([i, r]) => [
          i,
          Object.fromEntries(ENDPOINTS.map((e) => [e, r.samples(e, startedAt)])),
        ]),
      ),
    }),
  );
  log("figures written to .data/load/scale-last.json, every answer to .data/load/scale-requests.json");
  return figures.passed ? 0 : 1;
}

async function killApp(stack: ScaleStack, note: (n: string, w: string) => void) {
  await new Promise((r) => setTimeout(r, 1500));
  note("app instance killed", "SIGKILL to app-a while wave 3's uploads run");
  await stack.parts.kill("app-a", "SIGKILL");
  await new Promise((r) => setTimeout(r, 10_000));
  await stack.parts.restart("app-a");
  // as a deployment would: its routes loaded while HAProxy's checks pass and its slow start ramps up
  await warmRoutes(SCALE.appA);
  note(
    "app instance killed",
    "app-a started again, listening and warmed; HAProxy adds it back after two good checks, at full weight after 5 s",
  );
}

async function killWorker(
  stack: ScaleStack,
  primary: ReturnType<typeof openServer>,
  note: (n: string, w: string) => void,
) {
  const id = /started as (\S+)/.exec(readFileSync(stack.parts.get("worker-1")!.logFile, "utf8"))?.[1] ?? "";
  let job = 0;
  await until(
    "worker-1 holding a check",
    async () => {
      const [rows] = await primary.query(
        "select id from check_jobs where kind = 'check' and status = 'running' and locked_by = ?",
        [id],
      );
      job = Number((rows as { id: number }[])[0]?.id ?? 0);
      return job > 0;
    },
    300_000,
  );
  await stack.parts.kill("worker-1", "SIGKILL");
  note("worker killed", `SIGKILL to worker-1 (${id}) mid-check of job ${job}`);
  await until(
    `job ${job} finished by the other worker`,
    async () => {
      const [rows] = await primary.query("select status, locked_by as by_ from check_jobs where id = ?", [
        job,
      ]);
      const r = (rows as { status: string; by_: string }[])[0];
      return r?.status === "done";
    },
    600_000,
  );
  const [rows] = await primary.query("select locked_by as by_, attempts from check_jobs where id = ?", [job]);
  note(
    "worker killed",
    `job ${job} done by ${(rows as { by_: string }[])[0]?.by_} on attempt ${(rows as { attempts: number }[])[0]?.attempts}; worker-1 started again`,
  );
  await stack.parts.restart("worker-1");
}

async function stopReplica(
  stack: ScaleStack,
  note: (n: string, w: string) => void,
  selectsAt: () => Promise<{ primary: number | null; replica: number | null }>,
) {
  // the replica's share just before: 5 s of reads with it up
  const before = await selectsAt();
  await new Promise((r) => setTimeout(r, 5000));
  const up = await selectsAt();
  await stack.dbAsync("replica", "stop");
  note("replica stopped", "bash scripts/db.sh replica stop; 20 s without it");
  const t0 = await selectsAt();
  await new Promise((r) => setTimeout(r, 20_000));
  const t1 = await selectsAt();
  note(
    "replica stopped",
    `SELECTs in the 5 s before: replica ${(up.replica ?? 0) - (before.replica ?? 0)}, primary ${(up.primary ?? 0) - (before.primary ?? 0)}; in the 20 s without it: primary ${(t1.primary ?? 0) - (t0.primary ?? 0)}`,
  );
  await stack.dbAsync("replica", "start");
  note("replica stopped", "replica started again: it resumes from its GTID position");
}

async function restartPrimary(stack: ScaleStack, note: (n: string, w: string) => void) {
  await new Promise((r) => setTimeout(r, 1500));
  const t = Date.now();
  await stack.dbAsync("stop");
  note("primary restarted", "bash scripts/db.sh stop during wave 8's uploads");
  await stack.dbAsync("start");
  note(
    "primary restarted",
    `bash scripts/db.sh start: the primary answered again ${((Date.now() - t) / 1000).toFixed(1)} s after the stop began`,
  );
}

export { SCALE };
