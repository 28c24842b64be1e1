/**
 * The proposals a batch could get, before its cells are counted: from the plan, the file's
 * header and the report's findings. Only mechanical fixes are candidates; ./propose.ts counts
 * them on the file and keeps those whose certainty the data confirms.
 */
import type { FindingCode } from "../codes";
import { quote } from "../findings";
import type { Plan, PlanColumn } from "../plan";
import type { ReadinessReport } from "../report";
import { oneEditApart } from "../values";
import type { FixCode, FixProposal, FixRule } from "./types";

const squash = (s: string) =>
  s
    .trim()
    .toLowerCase()
    .replace(/[\s_-]/g, "");

/** A candidate: a proposal whose count and examples are still to be found. */
export type Candidate = Omit<FixProposal, "cells" | "examples">;

function candidate(
  code: FixCode,
  column: string,
  rule: FixRule,
  message: string,
  resolves: FindingCode[] = [],
): Candidate {
  return { id: `${code}:${column}`, code, column, resolves, message, rule };
}

/**
 * Headers to rename: a planned column absent from the header, and exactly one unplanned header
 * that is the same name but for case, spaces, `_` and `-`, or (names of four characters or more)
 * one edit away — and that header is near no other missing planned column.
 */
export function renameCandidates(header: string[], plan: Plan, report: ReadinessReport): Candidate[] {
  const names = header.map((h) => h.trim());
  const planned = new Set(plan.columns.map((c) => c.name));
  const free = [...new Set(names)].filter((h) => h !== "" && !planned.has(h));
  const missing = plan.columns.filter((c) => c.role !== "ignore" && !names.includes(c.name));
  const near = (h: string, p: string) => {
    const a = squash(h);
    const b = squash(p);
    return a === b || (Math.min(a.length, b.length) >= 4 && oneEditApart(a, b));
  };
  const out: Candidate[] = [];
  for (const pc of missing) {
    const hs = free.filter((h) => near(h, pc.name));
    if (hs.length !== 1) continue;
    const h = hs[0]!;
    if (missing.some((o) => o !== pc && near(h, o.name))) continue;
    const flagged = report.findings.some(
      (f) => f.code === "plan.column-missing" && f.columns.includes(pc.name),
    );
    out.push(
      candidate(
        "header.rename",
        pc.name,
        { kind: "rename", from: h, to: pc.name },
        `Rename the column ${quote(h)} to the planned ${quote(pc.name)}.`,
        flagged ? ["plan.column-missing"] : [],
      ),
    );
  }
  return out;
}

/** Level merges of the report's level.variant finding whose target is a planned level. */
function levelCandidate(pc: PlanColumn, report: ReadinessReport): Candidate | null {
  const planned = pc.levels ?? [];
  const f = report.findings.find((x) => x.code === "level.variant" && x.columns[0] === pc.name);
  const merges = ((f?.detail?.merges ?? []) as { from: string; to: string }[]).filter((m) =>
    planned.includes(m.to),
  );
  if (!merges.length) return null;
  const values = Object.fromEntries(merges.map((m) => [m.from, m.to]));
  const unknown = report.findings.find((x) => x.code === "level.unknown" && x.columns[0] === pc.name);
  const unknownLevels = ((unknown?.detail?.levels ?? []) as { level: string }[]).map((l) => l.level);
  const resolves: FindingCode[] = ["level.variant"];
  if (unknown && unknownLevels.every((l) => l in values)) resolves.push("level.unknown");
  const words = merges.map((m) => `${quote(m.from)} → ${quote(m.to)}`).join(", ");
  return candidate(
    "level.variant",
    pc.name,
    { kind: "map", values },
    `Write the plan's level instead of its spelling variant in ${quote(pc.name)}: ${words}.`,
    resolves,
  );
}

/** Every candidate of one planned column (dates: both orders; ./propose.ts keeps the certain one). */
export function columnCandidates(
  pc: PlanColumn,
  plan: Plan,
  report: ReadinessReport,
  confirmed: number[],
): Candidate[] {
  if (pc.role === "ignore") return [];
  const out: Candidate[] = [];
  const tokens = [...new Set([...plan.missingTokens, ...(pc.missingTokens ?? [])])].filter(
    (t) => t.trim() !== "",
  );
  if (tokens.length) {
    out.push(
      candidate(
        "missing.token",
        pc.name,
        { kind: "empty-tokens", tokens },
        `Leave the cells of ${quote(pc.name)} that hold the study's missing-value token${tokens.length > 1 ? "s" : ""} ${tokens.map(quote).join(", ")} empty.`,
      ),
    );
  }
  if (pc.type === "category") {
    const level = levelCandidate(pc, report);
    if (level) out.push(level);
    const except = level?.rule.kind === "map" ? Object.keys(level.rule.values) : [];
    out.push(
      candidate(
        "text.trim",
        pc.name,
        { kind: "trim", except },
        `Trim the spaces before and after the values of ${quote(pc.name)}.`,
      ),
    );
  }
  if (pc.type === "number" || pc.type === "integer") {
    const values = [...new Set([...(pc.sentinels ?? []), ...confirmed])];
    if (values.length) {
      const flagged = report.findings.some(
        (f) =>
          f.code === "number.sentinel" &&
          f.columns[0] === pc.name &&
          values.includes(f.detail?.value as number),
      );
      out.push(
        candidate(
          "number.sentinel",
          pc.name,
          { kind: "empty-numbers", values },
          `Leave the cells of ${quote(pc.name)} that hold the missing-value code${values.length > 1 ? "s" : ""} ${values.join(", ")} empty.`,
          flagged ? ["number.sentinel"] : [],
        ),
      );
    }
    const comma = report.findings.some((f) => f.code === "number.decimal-comma" && f.columns[0] === pc.name);
    if (comma) {
      out.push(
        candidate(
          "number.decimal-comma",
          pc.name,
          { kind: "decimal-comma" },
          `Write the numbers of ${quote(pc.name)} with a decimal point instead of a comma.`,
          ["number.decimal-comma"],
        ),
      );
    }
  }
  if (pc.type === "date") {
    for (const order of ["dmy", "mdy"] as const) {
      const words = order === "dmy" ? "day/month/year" : "month/day/year";
      out.push({
        ...candidate(
          "date.iso",
          pc.name,
          { kind: "date", order },
          `Write the dates of ${quote(pc.name)} (${words}) as YYYY-MM-DD.`,
        ),
        id: `date.iso:${pc.name}:${order}`,
      });
    }
  }
  return out;
}
