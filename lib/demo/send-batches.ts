/**
 * Sends the demo scenario's batch files through the real pipeline: stored in the upload
 * service through the SDK, recorded as batch versions with their check jobs, checked by the
 * worker. Idempotent: a batch already sent (same organisation, study and title) is skipped.
 */
import { and, eq } from "drizzle-orm";
import { UTFile } from "uploadthing/server";
import type { Db } from "@/db/client";
import { batches, organisations, studies, users } from "@/db/schema";
import { recordBatchVersion } from "@/lib/intake/record-upload";
import { utapi } from "@/lib/uploads";
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
      db,
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
