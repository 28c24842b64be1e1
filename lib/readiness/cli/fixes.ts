/** --apply-fixes: the checked file with the report's fix proposals applied, and its change log. */
import { applyFixesToFile } from "../fixes/node";
import { countOf } from "../format-number";
import type { Plan } from "../plan";
import type { ReadinessReport } from "../report";

/** Writes OUT (and OUT.changes.csv); says what it did on stderr. Resolves to true when it failed. */
export async function applyFixes(
  file: string,
  out: string,
  plan: Plan,
  report: ReadinessReport,
  only: string[] | undefined,
): Promise<boolean> {
  try {
    const done = await applyFixesToFile(file, out, plan, report, only);
    const used = done.chosen.map((p) => `${p.id} (${countOf(p.cells, "cell")})`);
    process.stderr.write(
      `${done.chosen.length ? `applied ${used.join(", ")}` : "no fix proposal applies to this file"}: wrote ${out} ` +
        `(${countOf(done.changes.length, "cell")} changed) and the change log ${done.logPath}; ${file} is untouched. ` +
        "Check the corrected file before sending it.\n",
    );
    return false;
  } catch (e) {
    process.stderr.write(`${(e as Error).message}\n`);
    return true;
  }
}
