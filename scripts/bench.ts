/**
 * Benchmark (not a test): an invented 1,000,000-row, 16-column crop-trial file with three
 * categorical predictors and about 3 % missing in four columns; the CLI checks it, and R does
 * the same analysis by hand when Rscript is installed. Prints wall time, peak memory and both F.
 *   npm run bench [-- --rows N] [--tsx]
 */
import { spawnSync } from "node:child_process";
import { createWriteStream, existsSync, mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { mulberry32 } from "@/lib/readiness/accumulators";

const OUT = path.resolve("bench-out");
const rowsArg = process.argv.indexOf("--rows");
const ROWS = rowsArg > 0 ? Number(process.argv[rowsArg + 1]) : 1_000_000;
const CSV = path.join(OUT, `trial-${ROWS}.csv`);
const PLAN = path.join(OUT, "trial-plan.json");

const rng = mulberry32;

const FARMS = ["harrowgate", "fennick-hill", "brackenridge", "hollinsfold", "saltmarsh-end", "coldwell"];
const SOILS = ["loam", "clay", "sand", "silt"];
const VARIETIES = ["Amberlea", "Corrin", "Halvard", "Tessmoor"];

const plan = {
  columns: [
    { name: "plot_id", role: "key", type: "integer" },
    { name: "farm", role: "predictor", type: "category", levels: FARMS },
    { name: "season", role: "carry", type: "integer" },
    { name: "soil", role: "predictor", type: "category", levels: SOILS },
    { name: "variety", role: "predictor", type: "category", levels: VARIETIES },
    { name: "nitrogen", role: "predictor", type: "number", min: 0, max: 300 },
    { name: "irrigation", role: "predictor", type: "number", min: 0 },
    { name: "rainfall", role: "predictor", type: "number", min: 0 },
    { name: "sowing_day", role: "predictor", type: "integer" },
    { name: "density", role: "predictor", type: "number" },
    { name: "organic_matter", role: "predictor", type: "number" },
    { name: "ph", role: "predictor", type: "number", min: 3, max: 10 },
    { name: "temperature", role: "predictor", type: "number" },
    { name: "slope", role: "predictor", type: "number" },
    { name: "sample_date", role: "carry", type: "date" },
    { name: "yield", role: "response", type: "number" },
  ],
};

async function generate() {
  const r = rng(20261201);
  const norm = () => {
    const u = Math.max(r(), 1e-12);
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * r());
  };
  const ws = createWriteStream(CSV);
  const write = (s: string) => new Promise<void>((res) => (ws.write(s) ? res() : ws.once("drain", () => res())));
  await write(plan.columns.map((c) => c.name).join(",") + "\n");
  const miss = (v: string) => (r() < 0.03 ? "" : v);
  let buf = "";
  for (let i = 1; i <= ROWS; i++) {
    const fi = Math.floor(r() * 6);
    const si = Math.floor(r() * 4);
    const vi = Math.floor(r() * 4);
    const n = 40 + r() * 200;
    const irr = 20 + r() * 120;
    const rain = 150 + r() * 250;
    const sow = 60 + Math.floor(r() * 50);
    const dens = 220 + r() * 160;
    const om = 1 + r() * 5;
    const ph = 5.5 + r() * 2.5;
    const temp = 9 + r() * 8 + 0.01 * sow;
    const slope = r() * 12;
    const y = 2 + 0.012 * n + 0.004 * irr + 0.003 * rain - 0.01 * sow + 0.002 * dens + 0.15 * om + 0.1 * ph + 0.05 * temp - 0.02 * slope + [0, -0.3, 0.2, 0.1][si]! + [0, 0.25, -0.15, 0.4][vi]! + fi * 0.05 + 0.6 * norm();
    const month = 3 + Math.floor(r() * 3);
    const day = 1 + Math.floor(r() * 28);
    buf += `${i},${FARMS[fi]},${2020 + (i % 6)},${SOILS[si]},${VARIETIES[vi]},${n.toFixed(1)},${miss(irr.toFixed(1))},${rain.toFixed(1)},${sow},${miss(dens.toFixed(0))},${miss(om.toFixed(2))},${miss(ph.toFixed(2))},${temp.toFixed(2)},${slope.toFixed(2)},2026-${String(month).padStart(2, "0")}-${String(day).padStart(2, "0")},${y.toFixed(3)}\n`;
    if (buf.length > 1 << 20) {
      await write(buf);
      buf = "";
    }
  }
  await write(buf);
  await new Promise<void>((res) => ws.end(() => res()));
}

interface Timed {
  wallS: number;
  /** user + system CPU seconds (all threads) */
  cpuS: number;
  peakMB: number;
  stdout: string;
  status: number | null;
}

/** Run a command under /usr/bin/time -v (wall clock and maximum resident set size). */
function timed(cmd: string, args: string[]): Timed {
  const useTime = existsSync("/usr/bin/time");
  const t0 = performance.now();
  const res = useTime ? spawnSync("/usr/bin/time", ["-v", cmd, ...args], { encoding: "utf8", maxBuffer: 1 << 28 }) : spawnSync(cmd, args, { encoding: "utf8", maxBuffer: 1 << 28 });
  const wallS = (performance.now() - t0) / 1000;
  const m = /Maximum resident set size \(kbytes\): (\d+)/.exec(res.stderr ?? "");
  const peakMB = m ? Number(m[1]) / 1024 : NaN;
  const user = Number(/User time \(seconds\): ([\d.]+)/.exec(res.stderr ?? "")?.[1] ?? NaN);
  const sys = Number(/System time \(seconds\): ([\d.]+)/.exec(res.stderr ?? "")?.[1] ?? NaN);
  if (res.status !== 0 && res.status !== 1) process.stderr.write(res.stderr ?? "");
  return { wallS, cpuS: user + sys, peakMB, stdout: res.stdout ?? "", status: res.status };
}

const R_SCRIPT = `
suppressMessages({ library(data.table); library(car) })
args <- commandArgs(TRUE)
d <- fread(args[1], showProgress = FALSE)
print(colSums(is.na(d)))
for (f in c("farm", "soil", "variety")) print(table(d[[f]], useNA = "ifany"))
d[, farm := factor(farm, levels = c(${FARMS.map((f) => `"${f}"`).join(", ")}))]
d[, soil := factor(soil, levels = c(${SOILS.map((f) => `"${f}"`).join(", ")}))]
d[, variety := factor(variety, levels = c(${VARIETIES.map((f) => `"${f}"`).join(", ")}))]
fit <- lm(yield ~ farm + soil + variety + nitrogen + irrigation + rainfall + sowing_day + density + organic_matter + ph + temperature + slope, data = d)
s <- summary(fit)
print(vif(fit))
X <- model.matrix(fit)
X <- sweep(X, 2, sqrt(colSums(X^2)), "/")
cat("condition number", kappa(X, exact = TRUE), "\\n")
cat(sprintf("n %d\\n", nrow(X)))
cat(sprintf("F %.10g\\n", s$fstatistic[1]))
`;

async function main() {
  mkdirSync(OUT, { recursive: true });
  writeFileSync(PLAN, JSON.stringify(plan, null, 2));
  if (!existsSync(CSV)) {
    const t0 = performance.now();
    process.stdout.write(`generating ${CSV} (${ROWS.toLocaleString("en")} rows)… `);
    await generate();
    process.stdout.write(`${((performance.now() - t0) / 1000).toFixed(1)} s\n`);
  }
  // The CLI's code bundled once with esbuild (tsx's dependency), so that the timing is the
  // engine's and not tsx compiling TypeScript at start-up; `--tsx` times `tsx scripts/check.ts`.
  let cliArgs = ["--import", "tsx", "scripts/check.ts"];
  if (!process.argv.includes("--tsx")) {
    const { build } = await import("esbuild");
    const bundle = path.join(OUT, "check.cjs");
    await build({ entryPoints: ["scripts/check.ts"], bundle: true, minify: true, platform: "node", format: "cjs", target: "node20", outfile: bundle, logLevel: "error" });
    cliArgs = [bundle];
  }
  const cli = timed(process.execPath, [...cliArgs, CSV, "--plan", PLAN, "--json"]);
  let F: number | null = null;
  let n = 0;
  try {
    const rep = JSON.parse(cli.stdout);
    F = rep.fit?.F ?? null;
    n = rep.rows.complete;
    process.stdout.write(`CLI: exit ${cli.status}, ${rep.rows.total.toLocaleString("en")} rows (${n.toLocaleString("en")} complete), ${rep.counts.blocker} blockers / ${rep.counts.warning} warnings / ${rep.counts.note} notes\n`);
  } catch {
    process.stdout.write(`CLI output was not JSON (exit ${cli.status})\n`);
  }
  const load = (await import("node:os")).loadavg()[0]!.toFixed(1);
  process.stdout.write(`CLI: ${cli.wallS.toFixed(2)} s wall (${cli.cpuS.toFixed(2)} s CPU; load average ${load}), ${(ROWS / cli.wallS).toLocaleString("en", { maximumFractionDigits: 0 })} rows/s, peak ${cli.peakMB.toFixed(0)} MB, F = ${F}\n`);
  const rscript = spawnSync("sh", ["-c", "command -v Rscript"], { encoding: "utf8" }).stdout.trim();
  if (!rscript) {
    process.stdout.write("Rscript not found: R comparison skipped\n");
    return;
  }
  const rFile = path.join(OUT, "bench.R");
  writeFileSync(rFile, R_SCRIPT);
  const r = timed(rscript, [rFile, CSV]);
  const rF = Number(/^F (\S+)/m.exec(r.stdout)?.[1] ?? NaN);
  const rN = Number(/^n (\d+)/m.exec(r.stdout)?.[1] ?? NaN);
  const cond = /condition number (\S+)/.exec(r.stdout)?.[1];
  process.stdout.write(`R:   ${r.wallS.toFixed(2)} s wall (${r.cpuS.toFixed(2)} s CPU), peak ${r.peakMB.toFixed(0)} MB, F = ${rF}, n = ${rN}, condition number ${cond}\n`);
  process.stdout.write(`ratio CLI/R: time ${(cli.wallS / r.wallS).toFixed(2)} (target ≤ 0.5), CPU ${(cli.cpuS / r.cpuS).toFixed(2)}, memory ${(cli.peakMB / r.peakMB).toFixed(2)}; peak ${cli.peakMB.toFixed(0)} MB (target < 400)\n`);
  if (F !== null) process.stdout.write(`F agreement: relative difference ${(Math.abs(F - rF) / rF).toExponential(2)}; complete cases ${n === rN ? "equal" : `differ (${n} vs ${rN})`}\n`);
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
