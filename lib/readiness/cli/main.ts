/**
 * The command `tributary-check`: check a batch file against a data plan before uploading it,
 * or draft a plan from a sample file. Standard output carries the result alone (the summary,
 * the report JSON or the drafted plan); messages go to standard error, progress only when
 * standard error is a terminal. Exit code 0 no blockers, 1 blockers, 2 unreadable or bad usage.
 */
import pkg from "../package.json" with { type: "json" };
import { ENGINE_VERSION } from "../check";
import { draftPlan } from "../draft";
import { REPORT_FORMAT } from "../report";
import { USAGE, UsageError, parseCliArgs, type CliOptions } from "./args";
import { checkInput, exitCodeOf, inputOf, loadPlan } from "./io";
import { checkPool, poolExitCode, poolJson, poolSummary } from "./pool";
import { summary } from "./summary";
import { applyFixes } from "./fixes";

async function draft(opts: CliOptions): Promise<number> {
  const input = inputOf(opts.files[0]!);
  const d = await draftPlan(input.stream(), { response: opts.response });
  if (d.error) {
    process.stderr.write(`${input.label} cannot be read: ${d.error.message}\nfix: ${d.error.fix}\n`);
    return 2;
  }
  process.stdout.write(`${JSON.stringify(d.plan, null, 2)}\n`);
  for (const n of d.notes) process.stderr.write(`note: ${n}\n`);
  return 0;
}

async function run(opts: CliOptions): Promise<number> {
  if (opts.help) {
    process.stdout.write(`${USAGE}\n`);
    return 0;
  }
  if (opts.version) {
    process.stdout.write(
      `tributary-check ${pkg.version} (checks ${ENGINE_VERSION}, report format ${REPORT_FORMAT})\n`,
    );
    return 0;
  }
  if (opts.draft) return draft(opts);
  const inputs = opts.files.map(inputOf);
  const plan = loadPlan(opts.plan!);
  if (opts.pool) {
    const o = await checkPool(inputs, plan, opts.workers);
    process.stdout.write(opts.json ? `${JSON.stringify(poolJson(o))}\n` : `${poolSummary(o)}\n`);
    return poolExitCode(o);
  }
  const report = await checkInput(inputs[0]!, plan, opts.workers);
  process.stdout.write(opts.json ? `${JSON.stringify(report)}\n` : `${summary(report, inputs[0]!.label)}\n`);
  if (opts.applyFixes && report.status === "checked") {
    const failed = await applyFixes(opts.files[0]!, opts.applyFixes, plan, report, opts.only);
    if (failed) return 2;
  }
  return exitCodeOf(report);
}

/** Run the command on its arguments; resolves to the exit code. */
export async function runCli(
  argv: string[],
  env: Record<string, string | undefined> = process.env,
): Promise<number> {
  try {
    return await run(parseCliArgs(argv, env));
  } catch (e) {
    if (!(e instanceof UsageError)) throw e;
    process.stderr.write(`${e.message}\n${USAGE}\n`);
    return 2;
  }
}
