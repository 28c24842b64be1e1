/**
 * `tributary-check FILE FILE… --pool`: each file is checked as one batch, then the files are
 * pooled from their engine states as the server pools accepted batches — the pool's figures
 * (poolReport) and its questions (poolQuestions: poolability by Chow tests, batch influence,
 * the overall F test, the selection preview). The files count as one provider.
 */
import { countOf, formatNumber } from "../format-number";
import { poolReport } from "../pool";
import { poolQuestions, type PoolMember, type PoolQuestions } from "../pooling";
import type { Plan } from "../plan";
import type { ReadinessReport } from "../report";
import { checkInput, exitCodeOf, type Input } from "./io";
import { summary } from "./summary";

export interface PoolOutput {
  files: { file: string; report: ReadinessReport }[];
  /** the pool's own report (the files' states merged), or null when a file could not be read */
  pool: ReadinessReport | null;
  /** poolQuestions' result (poolability, influence, selection, overall, findings, caution), or null */
  questions: PoolQuestions | null;
  /** why the pool was not computed */
  message: string | null;
}

export async function checkPool(
  inputs: Input[],
  plan: Plan,
  workers: number | undefined,
): Promise<PoolOutput> {
  const files: PoolOutput["files"] = [];
  for (const input of inputs)
    files.push({ file: input.label, report: await checkInput(input, plan, workers) });
  const unreadable = files.filter((f) => f.report.status === "unreadable");
  if (unreadable.length) {
    const names = unreadable.map((f) => f.file).join(", ");
    return {
      files,
      pool: null,
      questions: null,
      message: `The pool was not computed: ${names} cannot be read (see ${unreadable.length === 1 ? "its" : "their"} report).`,
    };
  }
  const members: PoolMember[] = files.map((f, i) => ({
    id: String(i + 1),
    label: f.file,
    group: "files",
    groupLabel: "these files",
    state: f.report.state as PoolMember["state"],
  }));
  const pool = await poolReport(
    members.map((m) => m.state),
    plan,
  );
  try {
    return { files, pool, questions: poolQuestions(members, plan), message: null };
  } catch (e) {
    if (!(e instanceof RangeError)) throw e;
    return { files, pool, questions: null, message: `The pool's questions were not computed: ${e.message}` };
  }
}

/** 2 when a file is unreadable or the pool could not be computed, 1 with a blocker anywhere, else 0. */
export function poolExitCode(o: PoolOutput): number {
  if (!o.pool || !o.questions) return 2;
  const codes = o.files.map((f) => exitCodeOf(f.report));
  const blockers = exitCodeOf(o.pool) === 1 || o.questions.findings.some((f) => f.severity === "blocker");
  return Math.max(...codes, blockers ? 1 : 0);
}

/** The JSON printed with --json: the pool's questions at the top level, the files' and the pool's reports beside them. */
export function poolJson(o: PoolOutput): Record<string, unknown> {
  return { ...(o.questions ?? {}), files: o.files, pool: o.pool, message: o.message };
}

const p = (x: number | null) => formatNumber(x, "pvalue");

export function poolSummary(o: PoolOutput): string {
  const lines: string[] = [];
  for (const f of o.files) {
    const c = f.report.counts;
    lines.push(
      `${f.file}: ${f.report.status === "unreadable" ? "UNREADABLE" : `${countOf(f.report.rows.total, "row")}`}, ${countOf(c.blocker, "blocker")}, ${countOf(c.warning, "warning")}, ${countOf(c.note, "note")}`,
    );
  }
  if (o.message) lines.push("", o.message);
  if (o.pool) lines.push("", summary(o.pool, `the pool of ${o.files.length} files`));
  const q = o.questions;
  if (q) {
    lines.push("", "Pool questions");
    if (q.overall)
      lines.push(
        `  overall F ${formatNumber(q.overall.F, "statistic")} on (${q.overall.df1}, ${q.overall.df2}) df, p ${p(q.overall.p)}: ${q.overall.words}`,
      );
    if (q.poolability.whole) lines.push(`  poolability: ${q.poolability.whole.words}`);
    for (const b of q.poolability.batches)
      lines.push(
        `    ${b.label}: ${b.kind === "chow" ? "Chow" : "predictive Chow"} F ${formatNumber(b.F, "statistic")}, p ${p(b.p)}`,
      );
    const heavy = q.influence.batches.filter((b) => b.influential);
    lines.push(
      `  influence: ${heavy.length ? heavy.map((b) => `${b.label} moves ${b.largest?.column} by ${formatNumber(b.largest?.shift ?? null, "estimate")} SE`).join("; ") : `no file moves a coefficient by more than ${q.influence.threshold} SE`}`,
    );
    if (q.selection)
      for (const pick of q.selection.picks)
        lines.push(
          `  selection by ${pick.criterion}: ${pick.terms.length ? pick.terms.join(" + ") : "(required terms only)"}`,
        );
    for (const f of q.findings) lines.push(`  [${f.severity.toUpperCase()}] ${f.code}: ${f.message}`);
    lines.push("", q.caution);
  }
  return lines.join("\n");
}
