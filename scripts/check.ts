/**
 * Command line: check a batch file against a data plan before uploading it.
 *   npm run check -- FILE --plan PLAN.json [--json]
 *   npm run check -- FILE --draft-plan
 *   npm run check -- FILE --plan PLAN.json --apply-fixes OUT.csv [--only CODE,…]
 * Exit code: 0 no blockers, 1 blockers, 2 unreadable file or bad usage.
 */
import { createReadStream, readFileSync, statSync } from "node:fs";
import { draftPlan, parsePlan, type ReadinessReport } from "../lib/readiness";
import { checkFile, isRangeWorker, runRangeWorker } from "../lib/readiness/node";
import { applyFixesToFile } from "../lib/readiness/fixes/node";

const USAGE = `usage: npm run check -- FILE --plan PLAN.json [--json] [--workers N] [--apply-fixes OUT.csv [--only CODE,…]]
       npm run check -- FILE --draft-plan [--response COLUMN]`;

function fail(msg: string): never {
  process.stderr.write(`${msg}\n${USAGE}\n`);
  process.exit(2);
}

function parseArgs(argv: string[]) {
  const out: { file?: string; plan?: string; json: boolean; draft: boolean; response?: string; workers?: number; applyFixes?: string; only?: string[] } = { json: false, draft: false };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (a === "--json") out.json = true;
    else if (a === "--draft-plan") out.draft = true;
    else if (a === "--plan") out.plan = argv[++i] ?? fail("--plan needs a file name");
    else if (a === "--apply-fixes") out.applyFixes = argv[++i] ?? fail("--apply-fixes needs the name of the corrected file to write");
    else if (a === "--only") out.only = (argv[++i] ?? fail("--only needs proposal codes, e.g. level.variant,number.decimal-comma")).split(",").map((x) => x.trim()).filter(Boolean);
    else if (a === "--response") out.response = argv[++i] ?? fail("--response needs a column name");
    else if (a === "--workers") {
      const n = Number(argv[++i]);
      if (!Number.isInteger(n) || n < 1 || n > 16) fail("--workers needs a whole number from 1 to 16");
      out.workers = n;
    }
    else if (a === "--help" || a === "-h") {
      process.stdout.write(`${USAGE}\n`);
      process.exit(0);
    } else if (a.startsWith("--")) fail(`unknown option ${a}`);
    else if (out.file) fail(`only one file at a time (got ${out.file} and ${a})`);
    else out.file = a;
  }
  return out;
}

function fmtNum(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return "–";
  return Math.abs(x) >= 1e5 || (Math.abs(x) < 1e-3 && x !== 0) ? x.toExponential(digits - 1) : x.toPrecision(digits);
}

function summary(r: ReadinessReport, file: string): string {
  const lines: string[] = [];
  const c = r.counts;
  lines.push(`Readiness report for ${file}`);
  if (r.status === "unreadable") {
    lines.push("  status: UNREADABLE");
  } else {
    lines.push(`  rows: ${r.rows.total.toLocaleString("en")} (complete for the model: ${r.rows.complete.toLocaleString("en")})`);
    lines.push(`  model: ${r.model.parameters} parameters, residual df ${r.model.residualDf} (target ${r.model.dfTarget})${r.model.perParameter !== null ? `, ${r.model.perParameter.toFixed(1)} rows per parameter` : ""}`);
    if (r.fit) {
      lines.push(`  fit preview: R² ${fmtNum(r.fit.rSquared)}, adjusted ${fmtNum(r.fit.adjRSquared)}, F ${fmtNum(r.fit.F, 6)} on (${r.fit.dfModel}, ${r.fit.dfResidual}) df, p ${r.fit.pValue === 0 ? "< 1e-300" : fmtNum(r.fit.pValue, 3)}`);
    }
  }
  lines.push(`  findings: ${c.blocker} blocker${c.blocker === 1 ? "" : "s"}, ${c.warning} warning${c.warning === 1 ? "" : "s"}, ${c.note} note${c.note === 1 ? "" : "s"}`);
  for (const f of r.findings) {
    lines.push("");
    lines.push(`[${f.severity.toUpperCase()}] ${f.code}${f.columns.length ? ` (${f.columns.join(", ")})` : ""}`);
    lines.push(`  ${f.message}`);
    if (f.rows.length) lines.push(`  rows: ${f.rows.join(", ")}${f.rowCount && f.rowCount > f.rows.length ? ` … (${f.rowCount.toLocaleString("en")} in all)` : ""}`);
    lines.push(`  fix: ${f.fix}`);
  }
  if (r.timings) lines.push("", `checked in ${(r.timings.ms / 1000).toFixed(2)} s`);
  return lines.join("\n");
}

async function main() {
  const args = parseArgs(process.argv.slice(2));
  if (!args.file) fail("no file given");
  let size = 0;
  try {
    const st = statSync(args.file);
    if (!st.isFile()) fail(`${args.file} is not a file`);
    size = st.size;
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === "ENOENT") fail(`${args.file}: no such file`);
    throw e;
  }
  const stream = () => createReadStream(args.file!, { highWaterMark: 1 << 20 });
  if (args.draft) {
    const d = await draftPlan(stream(), { response: args.response });
    if (d.error) {
      process.stderr.write(`${args.file} cannot be read: ${d.error.message}\nfix: ${d.error.fix}\n`);
      process.exit(2);
    }
    process.stdout.write(`${JSON.stringify(d.plan, null, 2)}\n`);
    for (const n of d.notes) process.stderr.write(`note: ${n}\n`);
    process.exit(0);
  }
  if (!args.plan) fail("--plan PLAN.json is required (or use --draft-plan)");
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(args.plan, "utf8"));
  } catch (e) {
    fail(`cannot read the plan ${args.plan}: ${(e as Error).message}`);
  }
  const parsed = parsePlan(raw);
  if (!parsed.ok) {
    process.stderr.write(`The plan ${args.plan} is not valid:\n${parsed.issues.map((i) => `  ${i.path || "(plan)"}: ${i.message}`).join("\n")}\n`);
    process.exit(2);
  }
  const showProgress = size > 20 << 20;
  let last = 0;
  const workers = args.workers ?? (process.env.TRIBUTARY_WORKERS !== undefined ? Number(process.env.TRIBUTARY_WORKERS) : undefined);
  const report = await checkFile(args.file, parsed.plan, {
    workers,
    fileName: args.file,
    onProgress: showProgress
      ? (p) => {
          const t = Date.now();
          if (t - last < 500) return;
          last = t;
          process.stderr.write(`\r  read ${p.rows.toLocaleString("en")} rows, ${((100 * p.bytes) / size).toFixed(0)} %   `);
        }
      : undefined,
  });
  if (showProgress) process.stderr.write("\n");
  if (args.json) process.stdout.write(`${JSON.stringify(report)}\n`);
  else process.stdout.write(`${summary(report, args.file)}\n`);
  process.exitCode = report.status === "unreadable" ? 2 : report.counts.blocker > 0 ? 1 : 0;
  if (args.only && !args.applyFixes) fail("--only goes with --apply-fixes OUT.csv");
  if (args.applyFixes && report.status === "checked") {
    try {
      const done = await applyFixesToFile(args.file, args.applyFixes, parsed.plan, report, args.only);
      const used = done.chosen.map((p) => `${p.id} (${p.cells.toLocaleString("en")} cell${p.cells === 1 ? "" : "s"})`);
      process.stderr.write(
        `${done.chosen.length ? `applied ${used.join(", ")}` : "no fix proposal applies to this file"}: wrote ${args.applyFixes} ` +
          `(${done.changes.length.toLocaleString("en")} cell${done.changes.length === 1 ? "" : "s"} changed) and the change log ${done.logPath}; ${args.file} is untouched. Check the corrected file before sending it.\n`,
      );
    } catch (e) {
      process.stderr.write(`${(e as Error).message}\n`);
      process.exitCode = 2;
    }
  }
}

if (isRangeWorker()) {
  // a worker thread of checkFile reading one byte range of a large file
  void runRangeWorker();
} else {
  main().catch((e) => {
    process.stderr.write(`internal error: ${(e as Error).stack ?? e}\n`);
    process.exit(2);
  });
}
