/** The command's inputs: files or standard input, the plan file, one batch checked. */
import { countOf, formatNumber } from "../format-number";
import { createReadStream, readFileSync, statSync } from "node:fs";
import { checkBatch } from "../check";
import { checkFile } from "../node";
import { parsePlan, type Plan } from "../plan";
import type { ReadinessReport } from "../report";
import { UsageError } from "./args";

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
      const share = input.size ? `, ${formatNumber(p.bytes / input.size, "percent")}` : "";
      process.stderr.write(`\r  ${input.label}: read ${countOf(p.rows, "row")}${share}   `);
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
          onProgress: progress.onProgress,
        })
      : await checkFile(input.arg, plan, { workers, fileName: input.label, onProgress: progress.onProgress });
  progress.done();
  return report;
}

export const exitCodeOf = (r: ReadinessReport) =>
  r.status === "unreadable" ? 2 : r.counts.blocker > 0 ? 1 : 0;
