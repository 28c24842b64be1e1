/**
 * Adds up the suites of one `npm test` run and prints the closing line `N passed, N failed`
 * (`, N skipped` when any were skipped). A suite that crashed, wrote no report, or exited
 * non-zero with no failing test counts as one failure: nothing is dropped silently.
 *
 *   npx tsx scripts/totals.ts <suites.tsv>
 *
 * Each line of suites.tsv: kind<TAB>label<TAB>exit code<TAB>report file (may be empty), where kind is
 * "vitest" (JSON reporter), "playwright" (JSON reporter), "step" (a command such as the build) or
 * "not-run" (a suite that could not start; exit code ignored, counts as one failure).
 */
import fs from "node:fs";

export interface Tally {
  passed: number;
  failed: number;
  skipped: number;
  /** why failures were added beyond the test counts */
  problems: string[];
}

interface VitestReport {
  numPassedTests?: number;
  numFailedTests?: number;
  numPendingTests?: number;
  numTodoTests?: number;
  success?: boolean;
  testResults?: { name: string; status: string; message?: string; assertionResults?: { status: string }[] }[];
}

interface PlaywrightReport {
  stats?: { expected?: number; unexpected?: number; flaky?: number; skipped?: number };
  errors?: { message?: string }[];
}

function readJson<T>(file: string): T | null {
  try {
    return JSON.parse(fs.readFileSync(file, "utf8")) as T;
  } catch {
    return null;
  }
}

/** Counts of a vitest JSON report; files that failed to load count as one failure each. */
export function tallyVitest(label: string, exitCode: number, file: string): Tally {
  const t: Tally = { passed: 0, failed: 0, skipped: 0, problems: [] };
  const r = readJson<VitestReport>(file);
  if (!r) {
    t.failed = 1;
    t.problems.push(`${label}: no readable report (${file}); the run crashed (exit code ${exitCode})`);
    return t;
  }
  t.passed = r.numPassedTests ?? 0;
  t.failed = r.numFailedTests ?? 0;
  t.skipped = (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
  for (const f of r.testResults ?? []) {
    const failedInside = (f.assertionResults ?? []).some((a) => a.status === "failed");
    if (f.status === "failed" && !failedInside) {
      t.failed += 1;
      const first = (f.message ?? "").split("\n")[0]?.slice(0, 200);
      t.problems.push(`${label}: ${f.name} failed to run${first ? `: ${first}` : ""}`);
    }
  }
  if (exitCode !== 0 && t.failed === 0) {
    t.failed = 1;
    t.problems.push(
      `${label}: exited with code ${exitCode} although no test failed (an unhandled error, see above)`,
    );
  }
  return t;
}

/** Counts of a Playwright JSON report: expected and flaky pass, unexpected fail. */
export function tallyPlaywright(label: string, exitCode: number, file: string): Tally {
  const t: Tally = { passed: 0, failed: 0, skipped: 0, problems: [] };
  const r = readJson<PlaywrightReport>(file);
  if (!r?.stats) {
    t.failed = 1;
    t.problems.push(`${label}: no readable report (${file}); the run crashed (exit code ${exitCode})`);
    return t;
  }
  t.passed = (r.stats.expected ?? 0) + (r.stats.flaky ?? 0);
  t.failed = r.stats.unexpected ?? 0;
  t.skipped = r.stats.skipped ?? 0;
  const errors = r.errors ?? [];
  if (errors.length > 0 && t.failed === 0) {
    t.failed = 1;
    t.problems.push(`${label}: ${errors[0]?.message?.split("\n")[0]?.slice(0, 200) ?? "a global error"}`);
  }
  if (exitCode !== 0 && t.failed === 0) {
    t.failed = 1;
    t.problems.push(`${label}: exited with code ${exitCode} although no test failed`);
  }
  return t;
}

export function tallyLine(kind: string, label: string, exitCode: number, file: string): Tally {
  switch (kind) {
    case "vitest":
      return tallyVitest(label, exitCode, file);
    case "playwright":
      return tallyPlaywright(label, exitCode, file);
    case "step":
      return exitCode === 0
        ? { passed: 0, failed: 0, skipped: 0, problems: [] }
        : { passed: 0, failed: 1, skipped: 0, problems: [`${label}: failed with exit code ${exitCode}`] };
    case "not-run":
      return { passed: 0, failed: 1, skipped: 0, problems: [`${label}: did not run`] };
    default:
      return { passed: 0, failed: 1, skipped: 0, problems: [`unknown suite kind "${kind}" for ${label}`] };
  }
}

/** The closing line: `N passed, N failed` plus `, N skipped` when any. */
export function closingLine(t: Pick<Tally, "passed" | "failed" | "skipped">): string {
  return `${t.passed} passed, ${t.failed} failed${t.skipped > 0 ? `, ${t.skipped} skipped` : ""}`;
}

function main(): void {
  const file = process.argv[2];
  if (!file) {
    console.error("usage: npx tsx scripts/totals.ts <suites.tsv>");
    process.exit(2);
  }
  const total: Tally = { passed: 0, failed: 0, skipped: 0, problems: [] };
  const lines = fs.existsSync(file)
    ? fs
        .readFileSync(file, "utf8")
        .split("\n")
        .filter((l) => l.trim())
    : [];
  if (lines.length === 0) {
    total.failed = 1;
    total.problems.push("no suite ran");
  }
  console.log("");
  for (const line of lines) {
    const [kind = "", label = "", code = "1", report = ""] = line.split("\t");
    const t = tallyLine(kind, label, Number(code), report);
    if (kind !== "step" || t.failed > 0) console.log(`  ${label}: ${closingLine(t)}`);
    total.passed += t.passed;
    total.failed += t.failed;
    total.skipped += t.skipped;
    total.problems.push(...t.problems);
  }
  for (const p of total.problems) console.log(`  ✗ ${p}`);
  console.log(closingLine(total));
  process.exitCode = total.failed > 0 ? 1 : 0;
}

if (process.argv[1]?.endsWith("totals.ts")) main();
