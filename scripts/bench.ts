/**
 * `npm run bench` — a benchmark, not a test. It makes an invented batch shaped like what
 * providers send (scripts/bench/generate.ts: text key, quoted notes with commas, two date styles,
 * category columns with spelling variants, 3 % missing in four of twelve numeric columns, CRLF)
 * and times, alternating in rounds, R's hand pipeline (scripts/bench/fit.R: fread, missing counts,
 * level tables, lm with the factors, car::vif, the scaled condition number) against
 * `npm run check` itself (start-up included) and the bundled command (the same bin without npm), each on one core
 * (--workers 1) and on all cores. Prints the median wall time, CPU, peak RSS, MB/s, the ratios
 * to R and whether F agrees, then the targets as met or missed. `--worker` adds the server
 * worker's figure (scripts/bench/worker.ts).
 *
 *   npm run bench [-- --rows 1000000] [--rounds 3] [--worker] [--worker-rows 200000]
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, renameSync, statSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { parseArgs } from "node:util";
import { FACTORS, GAPPY, GENERATOR_VERSION, NUMERIC, RESPONSE, generate, plan } from "./bench/generate";
import { hasGnuTime, median, timedRun, type Run } from "./bench/measure";
import { printSummary, reportKeyOf, type Measured } from "./bench/summary";

const { values: opt } = parseArgs({
  options: {
    rows: { type: "string", default: "1000000" },
    rounds: { type: "string", default: "3" },
    worker: { type: "boolean", default: false },
    "worker-rows": { type: "string", default: "200000" },
  },
});
const ROWS = Number(opt.rows);
const ROUNDS = Number(opt.rounds);
if (!Number.isInteger(ROWS) || ROWS < 100) throw new Error("--rows takes a whole number of at least 100");
if (!Number.isInteger(ROUNDS) || ROUNDS < 1 || ROUNDS > 20)
  throw new Error("--rounds takes a whole number from 1 to 20");

const ROOT = path.resolve(import.meta.dirname, "..");
const OUT = path.join(ROOT, "bench-out");
const CSV = path.join(OUT, `providers-v${GENERATOR_VERSION}-${ROWS}.csv`);
const PLAN = path.join(OUT, "providers-plan.json");
const CORES = os.availableParallelism();

interface Config {
  name: string;
  kind: "r" | "check" | "bundle";
  workers: number;
  cmd: string;
  args: string[];
}

/** F and complete cases from a run's output: the report JSON for ours, fit.R's last lines for R. */
function resultOf(
  c: Config,
  r: Run,
): { F: number | null; n: number | null; note: string; reportKey?: string } {
  if (c.kind === "r") {
    const F = Number(/^F (\S+)/m.exec(r.stdout)?.[1] ?? NaN);
    return {
      F: Number.isFinite(F) ? F : null,
      n: Number(/^n (\d+)/m.exec(r.stdout)?.[1] ?? NaN),
      note: `condition number ${/condition number (\S+)/.exec(r.stdout)?.[1] ?? "?"}`,
    };
  }
  try {
    const rep = JSON.parse(r.stdout);
    return {
      F: rep.fit?.F ?? null,
      n: rep.rows?.complete ?? null,
      reportKey: reportKeyOf(rep),
      note: `exit ${r.status}: ${rep.counts.blocker} blockers, ${rep.counts.warning} warnings, ${rep.counts.note} notes`,
    };
  } catch {
    return {
      F: null,
      n: null,
      note: `exit ${r.status}, no report: ${r.stderr.trim().split("\n").slice(-3).join(" / ")}`,
    };
  }
}

async function main() {
  mkdirSync(OUT, { recursive: true });
  writeFileSync(PLAN, JSON.stringify(plan, null, 2));
  if (!existsSync(CSV)) {
    const t0 = performance.now();
    process.stdout.write(`generating ${path.relative(ROOT, CSV)} (${ROWS.toLocaleString("en")} rows)… `);
    await generate(`${CSV}.part`, ROWS);
    renameSync(`${CSV}.part`, CSV);
    process.stdout.write(`${((performance.now() - t0) / 1000).toFixed(1)} s\n`);
  }
  const bytes = statSync(CSV).size;
  // the command itself without npm: tributary-check starts from its bundle (lib/readiness/bin),
  // built here once so that no timed run pays for the build
  const bin = path.join(ROOT, "lib/readiness/bin/tributary-check.mjs");
  spawnSync(process.execPath, [bin, "--version"], { stdio: "ignore" });

  const ours = ["--plan", PLAN, "--json"];
  const configs: Config[] = [];
  const rscript = spawnSync("sh", ["-c", "command -v Rscript"], { encoding: "utf8" }).stdout.trim();
  if (rscript) {
    const factors = Object.entries(FACTORS).map(([k, v]) => `${k}=${v.join(",")}`);
    configs.push({
      name: "R: fread, lm, car::vif, kappa",
      kind: "r",
      workers: 1,
      cmd: rscript,
      args: [path.join(ROOT, "scripts/bench/fit.R"), CSV, RESPONSE, NUMERIC.join(","), ...factors],
    });
  } else process.stdout.write("Rscript not found: the R comparison is skipped\n");
  for (const w of [...new Set([1, CORES])]) {
    const cores = w === 1 ? "1 core" : `${w} cores`;
    configs.push({
      name: `npm run check, ${cores}`,
      kind: "check",
      workers: w,
      cmd: "npm",
      args: ["run", "-s", "check", "--", CSV, ...ours, "--workers", String(w)],
    });
    configs.push({
      name: `bundled command, ${cores}`,
      kind: "bundle",
      workers: w,
      cmd: process.execPath,
      args: [bin, CSV, ...ours, "--workers", String(w)],
    });
  }

  const load0 = os.loadavg()[0]!;
  process.stdout.write(
    `${ROWS.toLocaleString("en")} rows × ${plan.columns.length} columns, ${(bytes / 1e6).toFixed(1)} MB; ${ROUNDS} round${ROUNDS > 1 ? "s" : ""} of ${configs.length} runs, alternating; ` +
      `${CORES} cores, load average ${load0.toFixed(1)}${hasGnuTime() ? "" : "; GNU time not found: CPU and memory not measured"}\n`,
  );
  const runs = new Map<
    Config,
    { run: Run; F: number | null; n: number | null; note: string; reportKey?: string }[]
  >(configs.map((c) => [c, []]));
  for (let round = 1; round <= ROUNDS; round++) {
    for (const c of configs) {
      const run = timedRun(c.cmd, c.args);
      const res = resultOf(c, run);
      runs.get(c)!.push({ run, ...res });
      process.stdout.write(
        `  round ${round}: ${c.name.padEnd(32)} ${run.wallS.toFixed(2).padStart(7)} s  ${res.note}\n`,
      );
    }
  }
  const measured: Measured[] = configs.map((c) => {
    const rs = runs.get(c)!;
    return {
      name: c.name,
      kind: c.kind,
      workers: c.workers,
      wallS: median(rs.map((r) => r.run.wallS)),
      cpuS: median(rs.map((r) => r.run.cpuS)),
      peakMB: Math.max(...rs.map((r) => r.run.peakMB)),
      F: rs[0]!.F,
      n: rs[0]!.n,
      reportKey: rs[0]!.reportKey,
      walls: rs.map((r) => r.run.wallS),
    };
  });

  let worker: { ms: number; rows: number; what: string } | null = null;
  if (opt.worker) {
    const w = spawnSync(
      "npx",
      [
        "tsx",
        "--conditions=react-server",
        path.join(ROOT, "scripts/bench/worker.ts"),
        "--rows",
        opt["worker-rows"]!,
      ],
      { encoding: "utf8", cwd: ROOT, maxBuffer: 1 << 26 },
    );
    const line = w.stdout.split("\n").find((l) => l.startsWith("{"));
    if (w.status === 0 && line) worker = JSON.parse(line);
    else
      process.stdout.write(
        `worker figure not measured (exit ${w.status}):\n${w.stderr.trim().split("\n").slice(-8).join("\n")}\n`,
      );
  }
  printSummary(measured, { bytes, rows: ROWS, gappy: GAPPY, load0, load1: os.loadavg()[0]!, worker });
}

main().catch((e) => {
  console.error(e);
  process.exit(2);
});
