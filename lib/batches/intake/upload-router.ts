import "server-only";
/**
 * The app's upload route: who may upload (checked before a byte is stored) and what an
 * upload becomes (a batch version with its check job).
 */
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { studies } from "@/db/schema";
import { getCurrentUser } from "@/lib/auth/session";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { makeFileRouter } from "@/lib/batches/intake/file-router";
import { batchFileProblem } from "./file-rules";
import { authoriseUpload } from "../commands-upload";
import { discard, recordStoredFile } from "./record-stored-file";
import { openStoredFile } from "./file-store";
import { correctionOf, fixRequest, type MachineCorrection } from "../fixes";

export async function studyIdBySlug(slug: string): Promise<number | null> {
  const [s] = await getDb().select({ id: studies.id }).from(studies).where(eq(studies.slug, slug));
  return s?.id ?? null;
}

export const batchFileRouter = makeFileRouter({
  async authorise(_req, input, files) {
    const user = await getCurrentUser();
    if (!user) throw new AppError("unauthenticated", "Your session has ended. Sign in again to upload.");
    for (const f of files) {
      const problem = batchFileProblem(f, env().MAX_UPLOAD_MB);
      if (problem) throw new AppError("invalid", problem);
    }
    const studyId = await studyIdBySlug(input.studySlug);
    if (studyId === null)
      throw new AppError(
        "not_found",
        "This study does not exist or your organisation is not admitted to it.",
      );
    const ok = await authoriseUpload(getDb(), user.id, { studyId, batchPublicId: input.batchId ?? null });
    // a study or batch outside the organisation answers like a missing one (404), not 403
    if (!ok.ok) throw new AppError(ok.code ?? "forbidden", ok.message);
    if (input.fixes && !input.batchId)
      throw new AppError("invalid", "Fixes apply to a version of an existing batch: name the batch.");
    return {
      userId: user.id,
      studyId,
      batchId: input.batchId ?? null,
      label: input.label ?? null,
      fixes: input.fixes ? JSON.stringify(input.fixes) : null,
    };
  },
  async onComplete(meta, file) {
    const stored = { key: file.key, url: file.ufsUrl, name: file.name, size: file.size, hash: file.fileHash };
    let fix: MachineCorrection | undefined;
    if (meta.fixes && meta.batchId) {
      // the server makes the corrected file itself; the upload must be exactly that file
      try {
        fix = await correctionOf(getDb(), meta.batchId, fixRequest.parse(JSON.parse(meta.fixes)), (key) =>
          openStoredFile(key),
        );
      } catch (e) {
        await discard(stored);
        throw e;
      }
      if (file.fileHash && file.fileHash !== fix.md5) {
        await discard(stored);
        throw new AppError(
          "invalid",
          `The uploaded file is not what the chosen fixes make of version ${fix.fromVersion}. Apply the fixes again on the batch page, or upload your own file as an ordinary new version.`,
        );
      }
    }
    const recorded = await recordStoredFile(
      meta.userId,
      { studyId: meta.studyId, batchPublicId: meta.batchId, title: meta.label },
      stored,
      fix,
    );
    return { batchId: recorded.batchPublicId, version: recorded.version };
  },
});
