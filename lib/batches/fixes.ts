/**
 * Machine-corrected versions (issue 12): the server makes the corrected file itself from the
 * earlier version's stored file, its stored report and the named proposals — the same engine
 * code the browser ran — so the change log it stores is what was applied, and an uploaded file
 * that is not exactly that corrected file (compared by md5) is refused as a machine correction.
 * No `server-only` import: tests call it in plain Node.
 */
import { createHash } from "node:crypto";
import { and, desc, eq } from "drizzle-orm";
import { z } from "zod";
import type { DbOrTx } from "@/db/client";
import { batches, batchVersions, dataPlans, reports } from "@/db/schema";
import { AppError } from "@/lib/errors";
import {
  applyFixes,
  parsePlan,
  proposeFixes,
  selectProposals,
  type FixChange,
  type ReadinessReport,
} from "@/lib/readiness";

/** What the browser sends with a corrected file: the version it corrected and the proposals it applied. */
export const fixRequest = z.object({
  fromVersion: z.number().int().positive(),
  proposals: z.array(z.string().min(1).max(200)).min(1, "Choose at least one fix.").max(50),
  /** values the provider confirmed mean "not measured" (each a sentinel the report suspects) */
  confirmedSentinels: z
    .array(z.object({ column: z.string().min(1).max(200), value: z.number().finite() }))
    .max(50)
    .default([]),
});
export type FixRequest = z.input<typeof fixRequest>;

export type AppliedProposal = {
  id: string;
  code: string;
  column: string;
  cells: number;
  message: string;
  /** number.sentinel: the values the provider confirmed mean "not measured" (beyond the plan's) */
  confirmed?: number[];
};

export interface MachineCorrection {
  fromVersionId: number;
  fromVersion: number;
  proposals: AppliedProposal[];
  changes: FixChange[];
  /** the sentinels the provider confirmed, as the fix request named them */
  confirmedSentinels: { column: string; value: number }[];
  /** md5 (hex) of the corrected bytes, as the upload service reports an upload's */
  md5: string;
}

type Open = (key: string) => Promise<ReadableStream<Uint8Array>>;

/** The corrected file of `req` for the batch, made on the server: its proposals, change log and md5. */
export async function correctionOf(
  db: DbOrTx,
  batchPublicId: string,
  req: FixRequest,
  open: Open,
): Promise<MachineCorrection> {
  const [row] = await db
    .select({ id: batchVersions.id, fileKey: batchVersions.fileKey, plan: dataPlans.plan })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(dataPlans, eq(dataPlans.id, batchVersions.planId))
    .where(and(eq(batches.publicId, batchPublicId), eq(batchVersions.version, req.fromVersion)));
  if (!row) throw new AppError("not_found", `Version ${req.fromVersion} of this batch was not found.`);
  const [stored] = await db
    .select({ report: reports.report })
    .from(reports)
    .where(eq(reports.batchVersionId, row.id))
    .orderBy(desc(reports.id))
    .limit(1);
  const report = stored?.report as ReadinessReport | undefined;
  const plan = parsePlan(row.plan);
  if (!report || report.status !== "checked" || !plan.ok) {
    throw new AppError(
      "invalid",
      `Version ${req.fromVersion} has no checked report, so no fixes can be applied to it.`,
    );
  }
  const confirmed = req.confirmedSentinels ?? [];
  for (const c of confirmed) {
    const suspected = report.findings.some(
      (f) =>
        f.code === "number.sentinel" &&
        f.detail?.declared === false &&
        f.columns[0] === c.column &&
        f.detail?.value === c.value,
    );
    if (!suspected)
      throw new AppError(
        "invalid",
        `The report of version ${req.fromVersion} does not suspect ${c.value} in ${c.column} of meaning "not measured"; only a suspected value can be confirmed. Reload the batch page and choose again.`,
      );
  }
  const proposals = await proposeFixes(await open(row.fileKey), plan.plan, report, {
    confirmedSentinels: confirmed,
  });
  const { chosen, unknown } = selectProposals(proposals, req.proposals);
  if (unknown.length || chosen.length !== req.proposals.length) {
    throw new AppError(
      "invalid",
      `Version ${req.fromVersion} has no fix ${[...unknown].join(", ") || "of that name"}; reload the batch page and choose the fixes again.`,
    );
  }
  const applied = applyFixes(await open(row.fileKey), chosen, {
    delimiter: report.file?.delimiter || undefined,
  });
  const md5 = createHash("md5");
  for await (const c of applied.output) md5.update(c);
  return {
    fromVersionId: row.id,
    fromVersion: req.fromVersion,
    proposals: chosen.map((p) => ({
      id: p.id,
      code: p.code,
      column: p.column,
      cells: p.cells,
      message: p.message,
      ...(p.code === "number.sentinel" && confirmed.some((c) => c.column === p.column)
        ? { confirmed: confirmed.filter((c) => c.column === p.column).map((c) => c.value) }
        : {}),
    })),
    changes: applied.changes,
    confirmedSentinels: confirmed,
    md5: md5.digest("hex"),
  };
}
