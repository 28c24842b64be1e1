/**
 * The command `tributary-check`: check a batch file against a data plan before uploading it,
 * or draft a plan from a sample file. Standard output carries the result alone (the summary,
 * the report JSON or the drafted plan); messages go to standard error, progress only when
 * standard error is a terminal. Exit code 0 no blockers, 1 blockers, 2 unreadable or bad usage.
 */
import { createReadStream, readFileSync, statSync } from "node:fs";
import pkg from "../package.json" with { type: "json" };
import { ENGINE_VERSION, checkBatch } from "../check";
import { draftPlan } from "../draft";
import { checkFile, fastAscii } from "../node";
import { parsePlan, type Plan } from "../plan";
import { REPORT_FORMAT, type ReadinessReport } from "../report";
import { USAGE, UsageError, parseCliArgs, type CliOptions } from "./args";
import { summary } from "./summary";

/** One input: a file on disk, or standard input for `-`. */
export interface Input {
  /** as written on the command line */
  arg: string;
  /** for messages and the report */
  label: string;
  /** bytes, when known */
  size: number | null;
  stream: () => AsyncIterable<Uint8Array>;
}

export function inputOf(arg: string): Input {
  if (arg === "-") return { arg, label: "standard input", size: null, stream: () => process.stdin };
  let size: number;
  try {
    const st = statSync(arg);
    if (!st.isFile()) throw new UsageError(`${arg} is not a file`);
    size = st.size;
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === "ENOENT") throw new UsageError(`${arg}: no such file`);
    throw e;
  }
  return { arg, label: arg, size, stream: () => createReadStream(arg, { highWaterMark: 1 << 20 }) };
}

/** Progress on standard error while reading, when it is a terminal and the input is not tiny. */
export function progressOf(input: Input): {
  onProgress?: (p: { rows: number; bytes: number }) => void;
  done: () => void;
} {
  if (!process.stderr.isTTY || (input.size !== null && input.size < 1 << 20)) return { done: () => {} };
  let last = 0;
  let shown = false;
  return {
    onProgress: (p) => {
      const t = Date.now();
      if (t - last < 500) return;
      last = t;
      shown = true;
      const share = input.size ? `, ${((100 * p.bytes) / input.size).toFixed(0)} %` : "";
      process.stderr.write(`\r  ${input.label}: read ${p.rows.toLocaleString("en")} rows${share}   `);
    },
    done: () => (shown ? void process.stderr.write("\n") : undefined),
  };
}

/** The plan file read and validated; UsageError with every field's message when it is not valid. */
export function loadPlan(file: string): Plan {
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(file, "utf8"));
  } catch (e) {
    throw new UsageError(`cannot read the plan ${file}: ${(e as Error).message}`);
  }
  const parsed = parsePlan(raw);
  if (!parsed.ok) {
    throw new UsageError(
      `The plan ${file} is not valid:\n${parsed.issues.map((i) => `  ${i.path || "(plan)"}: ${i.message}`).join("\n")}`,
    );
  }
  return parsed.plan;
}

/** One batch checked: a file through checkFile (worker threads when asked), standard input in one pass. */
export async function checkInput(
  input: Input,
  plan: Plan,
  workers: number | undefined,
): Promise<ReadinessReport> {
  const progress = progressOf(input);
  const report =
    input.size === null
      ? await checkBatch(input.stream(), plan, {
          fileName: input.label,
          fastAscii,
          onProgress: progress.onProgress,
        })
      : await checkFile(input.arg, plan, { workers, fileName: input.label, onProgress: progress.onProgress });
  progress.done();
  return report;
}

export const exitCodeOf = (r: ReadinessReport) =>
  r.status === "unreadable" ? 2 : r.counts.blocker > 0 ? 1 : 0;

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
  if (opts.pool) throw new UsageError("--pool is not available in this version");
  const report = await checkInput(inputs[0]!, plan, opts.workers);
  process.stdout.write(opts.json ? `${JSON.stringify(report)}\n` : `${summary(report, inputs[0]!.label)}\n`);
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
