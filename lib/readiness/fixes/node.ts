/**
 * Node-only (not part of the framework-free core): apply a file's fix proposals and write the
 * corrected file and its change log beside it — the command line's `--apply-fixes`.
 */
import fs from "node:fs";
import { isUtf8 } from "node:buffer";
import path from "node:path";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import type { Plan } from "../plan";
import type { ReadinessReport } from "../report";
import { changeLogCsv, selectProposals } from "./log";
import { proposeFixes } from "./propose";
import { applyFixes } from "./rewrite";
import type { FixChange, FixProposal } from "./types";

/** Where the change log of OUT.csv goes: OUT.changes.csv beside it. */
export function changeLogPath(out: string): string {
  const ext = path.extname(out);
  return path.join(path.dirname(out), `${path.basename(out, ext)}.changes.csv`);
}

export interface AppliedToFile {
  proposals: FixProposal[];
  chosen: FixProposal[];
  changes: FixChange[];
  logPath: string;
}

/**
 * The corrected file `out` from `file` (checked as `report` against `plan`) with the proposals
 * named in `only` (codes or ids; all when absent), and its change log. The original is only read.
 * Throws an Error whose message says what to fix (same path, an unknown proposal name).
 */
export async function applyFixesToFile(
  file: string,
  out: string,
  plan: Plan,
  report: ReadinessReport,
  only?: string[],
): Promise<AppliedToFile> {
  if (path.resolve(file) === path.resolve(out))
    throw new Error(
      `--apply-fixes writes a new file; give it another name than ${file} (the original stays untouched).`,
    );
  const open = () => fs.createReadStream(file, { highWaterMark: 1 << 20 });
  const proposals = await proposeFixes(open(), plan, report, { isUtf8 });
  const { chosen, unknown } = selectProposals(proposals, only);
  if (unknown.length) {
    const known = proposals.map((p) => p.id).join(", ") || "none";
    throw new Error(
      `--only names ${unknown.join(", ")}, which ${unknown.length > 1 ? "are" : "is"} not a proposal of this file (its proposals: ${known}).`,
    );
  }
  const applied = applyFixes(open(), chosen, { delimiter: report.file?.delimiter || undefined, isUtf8 });
  await pipeline(Readable.from(applied.output), fs.createWriteStream(out));
  const logPath = changeLogPath(out);
  fs.writeFileSync(logPath, changeLogCsv(applied.changes));
  return { proposals, chosen, changes: applied.changes, logPath };
}
