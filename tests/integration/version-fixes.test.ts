/**
 * Machine-corrected versions on the real MariaDB (issue 12, point 4): the worker stores the fix
 * proposals in the report; the server makes the corrected file itself from the stored original,
 * and the version made from it records where it came from, the fixes, the approver, the change
 * log and an audit row; the original stays as it was; stale or unknown fixes are refused.
 */
import { createHash } from "node:crypto";
import { afterAll, describe, expect, it } from "vitest";
import { and, eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { auditEvents, batchVersions, versionFixes } from "@/db/schema";
import { recordBatchVersion } from "@/lib/batches/commands-upload";
import { correctionOf } from "@/lib/batches/fixes";
import { claimJob } from "@/lib/batches/jobs/check-jobs";
import { runJob } from "@/lib/batches/jobs/worker";
import { barleyBatches } from "@/lib/demo/batches";
import { applyFixesToBytes, type FixChange } from "@/lib/readiness";
import {
  drainQueue,
  openMemoryFile,
  storeInMemory,
  studyId,
  uploadAndCheck,
  userId,
} from "./helpers/pipeline";

const db = getDb();
const FENNICK = barleyBatches()[1]!;

afterAll(async () => {
  await getPool().end();
});

describe("a machine-corrected version", () => {
  it("is made on the server from the stored original, recorded with its change log, and resolves the merge", async () => {
    const v1 = await uploadAndCheck("provider@fennick.test", "barley-nitrogen", FENNICK.csv, {
      name: FENNICK.fileName,
    });
    const proposal = v1.report!.proposals!.find((p) => p.id === "level.variant:soil")!;
    expect(proposal.cells).toBe(FENNICK.csv.split(/\r?\n/).filter((l) => /,(Clay|clay ),/.test(l)).length);

    const fix = await correctionOf(
      db,
      v1.batchPublicId,
      { fromVersion: 1, proposals: ["level.variant:soil"] },
      openMemoryFile,
    );
    const local = await applyFixesToBytes(new TextEncoder().encode(FENNICK.csv), [proposal]);
    expect(fix.md5).toBe(createHash("md5").update(local.bytes).digest("hex"));
    expect(fix.changes).toEqual(local.changes);
    expect(fix.changes).toHaveLength(proposal.cells);

    await drainQueue();
    const corrected = new TextDecoder().decode(local.bytes);
    const provider = await userId("provider@fennick.test");
    const v2 = await recordBatchVersion(
      provider,
      { studyId: await studyId("barley-nitrogen"), batchPublicId: v1.batchPublicId },
      storeInMemory(corrected, "fennick-corrected.csv"),
      fix,
    );
    if (!v2.ok) throw new Error(v2.message);
    expect(v2.data.version).toBe(2);
    const [row] = await db
      .select()
      .from(versionFixes)
      .where(eq(versionFixes.batchVersionId, v2.data.batchVersionId));
    expect(row).toMatchObject({
      fromVersionId: fix.fromVersionId,
      changeCount: proposal.cells,
      approvedById: provider,
    });
    expect(row!.changes as FixChange[]).toEqual(local.changes);
    const audit = await db
      .select()
      .from(auditEvents)
      .where(
        and(eq(auditEvents.batchId, v2.data.batchId), eq(auditEvents.action, "batch.machine-corrected")),
      );
    expect(audit).toHaveLength(1);
    expect(audit[0]!.after).toMatchObject({
      version: 2,
      fromVersion: 1,
      proposals: ["level.variant:soil"],
      changes: proposal.cells,
    });

    // the original version is untouched: same file key, superseded, its report as before
    const [orig] = await db.select().from(batchVersions).where(eq(batchVersions.id, fix.fromVersionId));
    expect(await new Response(await openMemoryFile(orig!.fileKey)).text()).toBe(FENNICK.csv);

    const job = await claimJob(db, "test-worker");
    const report = await runJob({ db, openFile: openMemoryFile }, job!);
    expect(report!.findings.filter((f) => f.code.startsWith("level."))).toEqual([]);
    expect(report!.rows.total).toBe(v1.report!.rows.total);
    expect(report!.proposals).toEqual([]);
  });

  it("refuses fixes of a version that is no longer the latest, and fixes the version does not have", async () => {
    const v1 = await uploadAndCheck("provider@fennick.test", "barley-nitrogen", FENNICK.csv);
    await expect(
      correctionOf(
        db,
        v1.batchPublicId,
        { fromVersion: 1, proposals: ["level.variant:farm"] },
        openMemoryFile,
      ),
    ).rejects.toThrow(/has no fix level\.variant:farm/);
    // a value the report does not suspect of meaning "not measured" cannot be confirmed as one
    // (Fennick's rainfall holds no -999: lib/demo/batches.ts), nor blanked without confirmation
    await expect(
      correctionOf(
        db,
        v1.batchPublicId,
        {
          fromVersion: 1,
          proposals: ["level.variant:soil"],
          confirmedSentinels: [{ column: "rainfall", value: -999 }],
        },
        openMemoryFile,
      ),
    ).rejects.toThrow(/does not suspect -999 in rainfall/);
    await expect(
      correctionOf(
        db,
        v1.batchPublicId,
        { fromVersion: 1, proposals: ["number.sentinel:rainfall"] },
        openMemoryFile,
      ),
    ).rejects.toThrow(/has no fix number\.sentinel:rainfall/);
    const fix = await correctionOf(
      db,
      v1.batchPublicId,
      { fromVersion: 1, proposals: ["level.variant:soil"] },
      openMemoryFile,
    );
    const v2 = await uploadAndCheck("provider@fennick.test", "barley-nitrogen", FENNICK.csv, {
      batchPublicId: v1.batchPublicId,
    });
    expect(v2.version).toBe(2);
    const late = await recordBatchVersion(
      await userId("provider@fennick.test"),
      { studyId: await studyId("barley-nitrogen"), batchPublicId: v1.batchPublicId },
      storeInMemory("x\n"),
      fix,
    );
    expect(late.ok).toBe(false);
    if (!late.ok)
      expect(late.message).toMatch(/Version 2 is now the latest; apply the fixes to it instead of version 1/);
    await drainQueue();
  });
});
