/**
 * Sends the demo scenario's batch files through the real pipeline: stored in the upload
 * service through the SDK, recorded as batch versions with their check jobs, checked by the
 * worker. Idempotent: a batch already sent (same organisation, study and title) is skipped.
 */
import { and, eq } from "drizzle-orm";
import { UTFile } from "uploadthing/server";
import type { Db } from "@/db/client";
import { batchVersions, batches, organisations, studies, users } from "@/db/schema";
import { sleep } from "@/lib/sleep";
import { decideVersion } from "@/lib/batches/commands-decide";
import { recordBatchVersion } from "@/lib/batches/commands-upload";
import { utapi } from "@/lib/batches/intake/file-store";
import { demoBatches, type DemoBatch } from "./batches";

export async function sendDemoBatches(db: Db, log: (line: string) => void = console.log, list: DemoBatch[] = demoBatches()): Promise<number> {
  let sent = 0;
  for (const b of list) {
    const [org] = await db.select({ id: organisations.id }).from(organisations).where(eq(organisations.slug, b.organisationSlug));
    const [study] = await db.select({ id: studies.id }).from(studies).where(eq(studies.slug, b.studySlug));
    if (!org || !study) {
      log(`skipped ${b.fileName}: organisation "${b.organisationSlug}" or study "${b.studySlug}" is not seeded`);
      continue;
    }
    const [already] = await db
      .select({ id: batches.id })
      .from(batches)
      .where(and(eq(batches.organisationId, org.id), eq(batches.studyId, study.id), eq(batches.title, b.title)));
    if (already) continue;
    const [uploader] = await db
      .select({ id: users.id })
      .from(users)
      .where(and(eq(users.organisationId, org.id), eq(users.role, "provider"), eq(users.active, true)))
      .limit(1);
    if (!uploader) {
      log(`skipped ${b.fileName}: ${b.organisationSlug} has no active provider user`);
      continue;
    }
    const bytes = new TextEncoder().encode(b.csv);
    const stored = await utapi().uploadFiles(new UTFile([bytes], b.fileName, { type: "text/csv" }), { acl: "private", contentDisposition: "attachment" });
    if (stored.error || !stored.data) throw new Error(`the upload service refused ${b.fileName}: ${stored.error?.message ?? "no answer"}`);
    const digest = await crypto.subtle.digest("SHA-256", bytes);
    const r = await recordBatchVersion(
      uploader.id,
      { studyId: study.id, title: b.title },
      { key: stored.data.key, url: stored.data.ufsUrl, name: b.fileName, size: bytes.length, hash: Buffer.from(digest).toString("hex") },
    );
    if (!r.ok) throw new Error(`${b.fileName} was not recorded: ${r.message}`);
    sent++;
    log(`sent ${b.fileName} (${b.shows})`);
  }
  return sent;
}

/**
 * The analysts' demo decisions (accept the clean batches, bounce one with comments), taken
 * through the real decision service once the worker has checked each version. Idempotent:
 * a version already decided is left alone.
 */
export async function decideDemoBatches(db: Db, log: (line: string) => void = console.log, list: DemoBatch[] = demoBatches(), timeoutMs = 120_000): Promise<number> {
  let decided = 0;
  const deadline = Date.now() + timeoutMs;
  for (const b of list) {
    if (!b.decision) continue;
    const [row] = await db
      .select({ publicId: batches.publicId, batchId: batches.id })
      .from(batches)
      .innerJoin(organisations, eq(organisations.id, batches.organisationId))
      .where(and(eq(organisations.slug, b.organisationSlug), eq(batches.title, b.title)));
    if (!row) continue;
    let state: string | undefined;
    for (;;) {
      const [v] = await db.select({ state: batchVersions.state }).from(batchVersions).where(and(eq(batchVersions.batchId, row.batchId), eq(batchVersions.version, 1)));
      state = v?.state;
      if (state !== "received" && state !== "checking") break;
      if (Date.now() > deadline) break;
      await sleep(1000);
    }
    if (state !== "ready") {
      if (state === "received" || state === "checking") log(`${b.fileName} is still being checked; its demo decision is left to you`);
      continue;
    }
    const [u] = await db.select({ id: users.id }).from(users).where(eq(users.email, b.decision.by));
    if (!u) continue;
    const r = await decideVersion(u.id, row.publicId, 1, { decision: b.decision.decision, comment: b.decision.comment ?? "", findingComments: b.decision.findingComments ?? [] });
    if (r.ok) {
      decided++;
      log(`${b.decision.decision === "accept" ? "accepted" : "bounced"} ${b.fileName}`);
    } else log(`could not decide ${b.fileName}: ${r.message}`);
  }
  return decided;
}
