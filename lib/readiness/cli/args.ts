/**
 * The command line's arguments, parsed by node:util parseArgs: `--opt value` and `--opt=value`
 * both work; several files only with --pool; `-` is standard input.
 */
import { parseArgs } from "node:util";

export const USAGE = `usage: tributary-check FILE --plan PLAN.json [--json] [--workers N]
       tributary-check FILE --plan PLAN.json --apply-fixes OUT.csv [--only CODE,…]
       tributary-check FILE --draft-plan [--response COLUMN]
       tributary-check FILE FILE… --pool --plan PLAN.json [--json]
       tributary-check --version
FILE - reads standard input. From the checkout: npx tributary-check … or npm run check -- …
Exit code: 0 no blockers, 1 blockers, 2 an unreadable file or bad usage.`;

export interface CliOptions {
  files: string[];
  plan?: string;
  json: boolean;
  draft: boolean;
  response?: string;
  workers?: number;
  pool: boolean;
  version: boolean;
  help: boolean;
  /** write the file with the report's fix proposals applied (and OUT.changes.csv beside it) */
  applyFixes?: string;
  /** only these proposals (codes or ids) */
  only?: string[];
}

/** A mistake in the arguments: the message says what to change (exit code 2). */
export class UsageError extends Error {}

const OPTIONS = {
  plan: { type: "string" },
  json: { type: "boolean" },
  "draft-plan": { type: "boolean" },
  response: { type: "string" },
  workers: { type: "string" },
  pool: { type: "boolean" },
  "apply-fixes": { type: "string" },
  only: { type: "string" },
  version: { type: "boolean" },
  help: { type: "boolean", short: "h" },
} as const;

const NEEDS: Record<string, string> = {
  plan: "--plan needs a file name",
  response: "--response needs a column name",
  workers: "--workers needs a whole number from 1 to 16",
  "apply-fixes": "--apply-fixes needs the name of the corrected file to write",
  only: "--only needs proposal codes, e.g. level.variant,number.decimal-comma",
};

/** parseArgs' own errors in the command's words. */
function usageOf(e: unknown): UsageError {
  const err = e as Error & { code?: string };
  const quoted = /'(--?[^' =]+)/.exec(err.message)?.[1] ?? "";
  const name = quoted.replace(/^--?/, "");
  if (err.code === "ERR_PARSE_ARGS_UNKNOWN_OPTION") return new UsageError(`unknown option ${quoted}`);
  if (err.code === "ERR_PARSE_ARGS_INVALID_OPTION_VALUE") {
    return new UsageError(NEEDS[name] ?? `${quoted} takes no value (write it alone, without =…)`);
  }
  return new UsageError(err.message);
}

/** The options of one invocation; throws UsageError for anything it cannot use. */
export function parseCliArgs(argv: string[], env: Record<string, string | undefined> = {}): CliOptions {
  let parsed: ReturnType<typeof parseArgs<{ options: typeof OPTIONS; allowPositionals: true }>>;
  try {
    parsed = parseArgs({ args: argv, options: OPTIONS, allowPositionals: true, strict: true });
  } catch (e) {
    throw usageOf(e);
  }
  const v = parsed.values;
  const out: CliOptions = {
    files: parsed.positionals,
    plan: v.plan,
    json: v.json ?? false,
    draft: v["draft-plan"] ?? false,
    response: v.response,
    pool: v.pool ?? false,
    version: v.version ?? false,
    help: v.help ?? false,
    applyFixes: v["apply-fixes"],
    only: v.only
      ?.split(",")
      .map((x) => x.trim())
      .filter(Boolean),
  };
  const workers = v.workers ?? env.TRIBUTARY_WORKERS;
  if (workers !== undefined) {
    const n = Number(workers);
    if (!Number.isInteger(n) || n < 1 || n > 16) {
      throw new UsageError(
        `${v.workers !== undefined ? "--workers" : "TRIBUTARY_WORKERS"} needs a whole number from 1 to 16 (got "${workers}")`,
      );
    }
    out.workers = n;
  }
  if (out.version || out.help) return out;
  if (out.files.length === 0) throw new UsageError("no file given");
  if (out.files.filter((f) => f === "-").length > 1)
    throw new UsageError("standard input (-) can be read only once");
  if (out.files.length > 1 && !out.pool) {
    throw new UsageError(
      `only one file at a time (got ${out.files[0]} and ${out.files[1]}); add --pool to check several batches as one pool`,
    );
  }
  if (out.draft && (out.pool || out.files.length > 1))
    throw new UsageError("--draft-plan reads one sample file; leave out --pool");
  if (!out.draft && !out.plan) throw new UsageError("--plan PLAN.json is required (or use --draft-plan)");
  if (out.only && !out.applyFixes) throw new UsageError("--only goes with --apply-fixes OUT.csv");
  if (out.applyFixes && (out.pool || out.draft || out.files[0] === "-"))
    throw new UsageError(
      "--apply-fixes rewrites one named file: give its path (not -) and leave out --pool and --draft-plan",
    );
  return out;
}
