/**
 * Throughput of the streaming least-squares state (not a test):
 *   npx tsx tests/helpers/bench-least-squares.ts [rows] [k]
 */
import { LeastSquares, PatternMoments, analyseDesign } from "@/lib/readiness/stats";

const rows = Number(process.argv[2] ?? 1_000_000);
const k = Number(process.argv[3] ?? 20);
let seed = 12345;
const u = () => {
  // mulberry32
  seed = (seed + 0x6d2b79f5) >>> 0;
  let t = seed;
  t = Math.imul(t ^ (t >>> 15), t | 1);
  t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
};
const pool = Array.from({ length: 4096 }, () => {
  const x = new Float64Array(k);
  x[0] = 1;
  for (let j = 1; j < k; j++) x[j] = j % 5 === 0 ? (u() < 0.3 ? 1 : 0) : u() * 10 + j;
  return { x, y: u() * 100 };
});

const ls = new LeastSquares(k);
const c0 = process.cpuUsage();
const t0 = performance.now();
for (let i = 0; i < rows; i++) {
  const r = pool[i & 4095]!;
  ls.addRow(r.x, r.y + i * 1e-6);
}
const t1 = performance.now();
const cpu = process.cpuUsage(c0);
const cpuMs = (cpu.user + cpu.system) / 1000;
const cols = ["intercept", ...Array.from({ length: k - 1 }, (_, j) => `x${j + 1}`)];
const res = analyseDesign(
  ls,
  {
    columns: cols,
    intercept: true,
    terms: cols.slice(1).map((c) => ({ term: c, columns: [c], df: 1 })),
    numericColumns: cols.slice(1),
  },
  { alpha: 0.05, power: 0.8 },
);
const t2 = performance.now();

const m = 10;
const pm = new PatternMoments(Array.from({ length: m }, (_, j) => `c${j}`));
const vals: (number | null)[] = new Array(m).fill(0);
const t3 = performance.now();
for (let i = 0; i < rows; i++) {
  const r = pool[i & 4095]!;
  for (let j = 0; j < m; j++) vals[j] = (i + j) % 17 === 0 ? null : (r.x[j + 1] as number);
  pm.addRow(vals);
}
const t4 = performance.now();

console.log(
  `LeastSquares.addRow: ${rows} rows × k = ${k}: ${(t1 - t0).toFixed(0)} ms wall → ${Math.round(rows / ((t1 - t0) / 1000)).toLocaleString("en")} rows/s; ${cpuMs.toFixed(0)} ms CPU → ${Math.round(rows / (cpuMs / 1000)).toLocaleString("en")} rows/s per core`,
);
console.log(
  `analyseDesign: ${(t2 - t1).toFixed(1)} ms (rank ${res.rank}, R² ${res.fit.rSquared.toFixed(4)})`,
);
console.log(
  `PatternMoments.addRow: ${rows} rows × m = ${m}: ${(t4 - t3).toFixed(0)} ms → ${Math.round(rows / ((t4 - t3) / 1000)).toLocaleString("en")} rows/s`,
);
