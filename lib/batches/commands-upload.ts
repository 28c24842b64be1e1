/**
 * Intake: who may send a batch to which study, and recording an uploaded file as a new
 * batch version with its check job — in one transaction, so a version never exists
 * without its job, and a job never without its version.
 */
import { randomBytes } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import type { DbOrTx } from "@/db/client";
import {
  batchVersions,
  batches,
  checkJobs,
  dataPlans,
  studies,
  studyProviders,
  versionFixes,
} from "@/db/schema";
import { loadActor, type Actor } from "@/lib/core/actor";
import { write } from "@/lib/core/write";
import { enqueuePoolQuestions } from "@/lib/core/pool-questions-queue";
import { fail, type Result } from "@/lib/result";
import { rebuildStoredPool } from "@/lib/pool";
import { cleanFileName, cleanText } from "./intake/file-rules";
import { now } from "@/lib/core/clock";
import type { MachineCorrection } from "./fixes";

export interface UploadTarget {
  studyId: number;
  /** resubmission: the batch this file is a new version of */
  batchPublicId?: string | null;
  title?: string | null;
}

/** A file in the store; `idempotencyKey`: the API upload's key (intake/idempotency.ts). */
export type StoredFile = { key: string; url: string; name: string; size: number } & {
  hash?: string | null;
  idempotencyKey?: string | null;
};

interface Admitted {
  actor: { id: number; organisationId: number };
  study: { id: number; title: string; planId: number };
  batch: { id: number; publicId: string; latestVersion: number } | null;
}

/**
 * May this user send this file to this study (and batch)? The role is read from the database
 * (lib/core/actor.ts), so a demotion or deactivation bites at once. Writes nothing.
 */
export async function authoriseUpload(
  db: DbOrTx,
  actorId: number,
  target: UploadTarget,
): Promise<Result<Admitted>> {
  return admit(db, await loadActor(db, actorId), target);
}

async function admit(db: DbOrTx, actor: Actor, target: UploadTarget): Promise<Result<Admitted>> {
  if (actor.role !== "provider" || actor.organisationId === null) {
    return { ok: false, message: "Only a provider organisation's users can send batches." };
  }
  const [study] = await db
    .select({
      id: studies.id,
      title: studies.title,
      status: studies.status,
      planVersion: studies.currentPlanVersion,
      admitted: studyProviders.organisationId,
    })
    .from(studies)
    .leftJoin(
      studyProviders,
      and(eq(studyProviders.studyId, studies.id), eq(studyProviders.organisationId, actor.organisationId)),
    )
    .where(eq(studies.id, target.studyId));
  if (!study || study.admitted === null) {
    return {
      ok: false,
      code: "not_found",
      message:
        "This study does not exist or your organisation is not admitted to it. Ask the study's lead to admit your organisation.",
    };
  }
  if (study.status !== "open")
    return { ok: false, message: `"${study.title}" is closed and takes no more batches.` };
  if (study.planVersion === null)
    return {
      ok: false,
      message: `"${study.title}" has no data plan yet; batches can be sent once the lead publishes one.`,
    };
  const [plan] = await db
    .select({ id: dataPlans.id })
    .from(dataPlans)
    .where(and(eq(dataPlans.studyId, study.id), eq(dataPlans.version, study.planVersion)));
  if (!plan) return { ok: false, message: `"${study.title}" has no data plan yet.` };

  let batch: Admitted["batch"] = null;
  if (target.batchPublicId) {
    const [b] = await db
      .select({
        id: batches.id,
        publicId: batches.publicId,
        latestVersion: batches.latestVersion,
        studyId: batches.studyId,
        organisationId: batches.organisationId,
      })
      .from(batches)
      .where(eq(batches.publicId, target.batchPublicId));
    // Another organisation's batch answers exactly like a missing one.
    if (!b || b.organisationId !== actor.organisationId || b.studyId !== study.id) {
      return {
        ok: false,
        code: "not_found",
        message: "That batch was not found in this study for your organisation.",
      };
    }
    const [latest] = await db
      .select({ state: batchVersions.state })
      .from(batchVersions)
      .where(and(eq(batchVersions.batchId, b.id), eq(batchVersions.version, b.latestVersion)));
    if (latest?.state === "accepted") {
      return { ok: false, message: "This batch is already accepted. Send new data as a new batch." };
    }
    batch = { id: b.id, publicId: b.publicId, latestVersion: b.latestVersion };
  }
  return {
    ok: true,
    data: {
      actor: { id: actor.id, organisationId: actor.organisationId },
      study: { id: study.id, title: study.title, planId: plan.id },
      batch,
    },
  };
}

export function newPublicId(): string {
  return randomBytes(12).toString("base64url");
}

const uploadTargetSchema = z.object({
  studyId: z.number().int().positive(),
  batchPublicId: z.string().max(64).nullish(),
  title: z.string().nullish(),
});

/**
 * Record a stored file as the next version of a batch (a new batch when none is named),
 * supersede the previous version, queue its check and write the audit rows. `fix`: the file is
 * the machine correction of the batch's latest version (./fixes.ts), recorded with its
 * proposals, change log and approver.
 */
export function recordBatchVersion(
  actorId: number,
  target: UploadTarget,
  file: StoredFile,
  fix?: MachineCorrection,
): Promise<Result<{ batchPublicId: string; batchId: number; version: number; batchVersionId: number }>> {
  // every path that records a file comes through here: its name is made safe once, for all
  const fileName = cleanFileName(file.name);
  return write({
    name: "recordBatchVersion",
    actorId,
    may: "batch.upload",
    forbidden: "Only a provider organisation's users can send batches.",
    // the same Idempotency-Key recorded by a simultaneous attempt: intake/api-upload.ts answers its version
    onDuplicate: () =>
      fail("This upload was recorded by another attempt a moment ago.", undefined, "conflict"),
    schema: uploadTargetSchema,
    input: target,
    run: async ({ tx, actor: who, audit }) => {
      const admitted = await admit(tx, who, target);
      if (!admitted.ok) return admitted;
      const { actor, study } = admitted.data;
      let batch = admitted.data.batch;
      if (batch) {
        // lock the batch row: two simultaneous resubmissions get versions n+1 and n+2
        const [locked] = await tx
          .select({ latestVersion: batches.latestVersion })
          .from(batches)
          .where(eq(batches.id, batch.id))
          .for("update");
        batch = { ...batch, latestVersion: locked?.latestVersion ?? batch.latestVersion };
      } else {
        const publicId = newPublicId();
        const title =
          cleanText(target.title ?? "", 300) || fileName.replace(/\.[^.]+$/, "") || "Untitled batch";
        const [ins] = await tx
          .insert(batches)
          .values({
            publicId,
            studyId: study.id,
            organisationId: actor.organisationId,
            title: title.slice(0, 300),
            createdById: actor.id,
          })
          .$returningId();
        if (!ins) throw new Error("inserting the batch returned no id");
        batch = { id: ins.id, publicId, latestVersion: 0 };
        await audit({
          action: "batch.created",
          objectType: "batch",
          objectId: publicId,
          studyId: study.id,
          batchId: batch.id,
          after: { title },
        });
      }
      const version = batch.latestVersion + 1;
      if (fix && fix.fromVersion !== batch.latestVersion) {
        return {
          ok: false,
          code: "conflict",
          message: `Version ${batch.latestVersion} is now the latest; apply the fixes to it instead of version ${fix.fromVersion}.`,
        };
      }
      if (batch.latestVersion > 0) {
        const [prev] = await tx
          .select({ id: batchVersions.id, state: batchVersions.state })
          .from(batchVersions)
          .where(and(eq(batchVersions.batchId, batch.id), eq(batchVersions.version, batch.latestVersion)));
        if (prev && prev.state !== "superseded") {
          await tx
            .update(batchVersions)
            .set({ state: "superseded", stateChangedAt: now() })
            .where(eq(batchVersions.id, prev.id));
          // an accepted version leaves the pool
          if (prev.state === "accepted") {
            await rebuildStoredPool(tx, study.id, { without: prev.id });
            await enqueuePoolQuestions(tx, study.id);
          }
          await audit({
            action: "batch.superseded",
            objectType: "batch_version",
            objectId: String(prev.id),
            studyId: study.id,
            batchId: batch.id,
            before: { state: prev.state, version: batch.latestVersion },
            after: { state: "superseded", by: version },
          });
        }
      }
      const [bv] = await tx
        .insert(batchVersions)
        .values({
          batchId: batch.id,
          version,
          planId: study.planId,
          fileKey: file.key,
          fileUrl: file.url,
          fileName,
          fileSize: file.size,
          contentHash: file.hash ?? null,
          idempotencyKey: file.idempotencyKey ?? null,
          state: "received",
          uploadedById: actor.id,
        })
        .$returningId();
      if (!bv) throw new Error("inserting the batch version returned no id");
      await tx.update(batches).set({ latestVersion: version }).where(eq(batches.id, batch.id));
      await tx.insert(checkJobs).values({ batchVersionId: bv.id });
      await audit({
        action: "batch.received",
        objectType: "batch_version",
        objectId: String(bv.id),
        studyId: study.id,
        batchId: batch.id,
        after: { state: "received", version, fileName, fileSize: file.size },
      });
      if (fix) {
        await tx.insert(versionFixes).values({
          batchVersionId: bv.id,
          fromVersionId: fix.fromVersionId,
          proposals: fix.proposals,
          changes: fix.changes,
          changeCount: fix.changes.length,
          approvedById: actor.id,
        });
        await audit({
          action: "batch.machine-corrected",
          objectType: "batch_version",
          objectId: String(bv.id),
          studyId: study.id,
          batchId: batch.id,
          after: {
            version,
            fromVersion: fix.fromVersion,
            proposals: fix.proposals.map((p) => p.id),
            changes: fix.changes.length,
            confirmedSentinels: fix.confirmedSentinels,
          },
        });
      }
      return {
        ok: true,
        data: { batchPublicId: batch.publicId, batchId: batch.id, version, batchVersionId: bv.id },
      };
    },
  });
}
