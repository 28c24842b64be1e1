/**
 * Benchmark (not a test) of the pool's questions: an invented pool of 100 batches (200 rows
 * each) with 25 candidate terms (22 numeric, 3 categorical with 3 levels), checked by the
 * engine; then poolQuestions times poolability, influence, the exhaustive selection preview
 * and leave-one-batch-out cross-validation from the 100 stored states. Prints the time.
 *   npx tsx scripts/bench-pool.ts [--batches N] [--rows N] [--candidates M] [--null]
 * With --stored it times the board and pool reads over a stored pool of 1,000 accepted versions
 * instead (scripts/bench/pool-stored.ts):
 *   npx tsx --conditions react-server scripts/bench-pool.ts --stored [--versions 1000] [--requests 200]
 */
import {
  checkBatch,
  isEngineState,
  mulberry32,
  parsePlan,
  poolQuestions,
  type PoolMember,
} from "@/lib/readiness";

const arg = (name: string, fallback: number) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const BATCHES = arg("batches", 100);
const ROWS = arg("rows", 200);
const M = arg("candidates", 25);
/** --null: no predictor has an effect (the hardest case for the bounds) */
const NULL = process.argv.includes("--null");
const FACTORS = 3;
const NUMERIC = M - FACTORS;
const LEVELS = ["low", "mid", "high"];

const names = [
  ...Array.from({ length: NUMERIC }, (_, i) => `x${i + 1}`),
  ...Array.from({ length: FACTORS }, (_, i) => `f${i + 1}`),
];
const parsed = parsePlan({
  columns: [
    ...Array.from({ length: NUMERIC }, (_, i) => ({ name: `x${i + 1}`, role: "predictor", type: "number" })),
    ...Array.from({ length: FACTORS }, (_, i) => ({
      name: `f${i + 1}`,
      role: "predictor",
      type: "category",
      levels: LEVELS,
    })),
    { name: "y", role: "response", type: "number" },
  ],
  selection: { candidates: names },
});
if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
const plan = parsed.plan;

async function* bytes(text: string) {
  yield new TextEncoder().encode(text);
}

async function main() {
  const r = mulberry32(2026);
  const norm = () => Math.sqrt(-2 * Math.log(Math.max(r(), 1e-12))) * Math.cos(2 * Math.PI * r());
  // a few strong effects, some weak, most none; neighbouring predictors correlated
  const beta = Array.from({ length: NUMERIC }, (_, i) => (NULL ? 0 : i < 4 ? 1 - i * 0.2 : i < 8 ? 0.08 : 0));
  const members: PoolMember[] = [];
  for (let b = 0; b < BATCHES; b++) {
    const lines = [[...names, "y"].join(",")];
    for (let i = 0; i < ROWS; i++) {
      const x: number[] = [];
      for (let j = 0; j < NUMERIC; j++) x.push(+(0.6 * (x[j - 1] ?? 0) + norm()).toFixed(5));
      const f = Array.from({ length: FACTORS }, () => Math.floor(r() * 3));
      const y =
        3 + x.reduce((s, v, j) => s + v * beta[j]!, 0) + (NULL ? 0 : 0.3 * f[0]! + 0.05 * f[1]!) + 2 * norm();
      lines.push([...x, ...f.map((l) => LEVELS[l]), y.toFixed(5)].join(","));
    }
    const report = await checkBatch(bytes(lines.join("\n") + "\n"), plan);
    if (!isEngineState(report.state)) throw new Error("no engine state");
    members.push({
      id: `b${b + 1}`,
      label: `batch ${b + 1}`,
      group: `p${(b % 20) + 1}`,
      groupLabel: `provider ${(b % 20) + 1}`,
      state: report.state,
    });
  }
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  const q = poolQuestions(members, plan);
  const ms = performance.now() - t0;
  const cpu = process.cpuUsage(c0);
  const s = q.selection!;
  console.log(
    `pool questions: ${BATCHES} batches × ${ROWS} rows, ${M} candidate terms (${q.parameters} coefficients), exhaustive ${s.exhaustive}: ${(ms / 1000).toFixed(2)} s (CPU ${((cpu.user + cpu.system) / 1e6).toFixed(2)} s)`,
  );
  console.log(
    `  picks: ${s.picks.map((p) => `${p.criterion} → size ${p.size}`).join(", ")}; LOBO folds ${s.lobo?.folds ?? 0}`,
  );
}

if (process.argv.includes("--stored")) void import("./bench/pool-stored").then((m) => m.benchStoredPool());
else void main();
