/**
 * The upload route for batch files. The SDK's file router is built here; what happens
 * before and after an upload (who may upload, what to record) is passed in, so the
 * intake code owns the rules and tests can supply their own.
 */
import { createUploadthing, type FileRouter } from "uploadthing/server";
import { UploadThingError } from "uploadthing/server";
import { z } from "zod";
import { rawSetting } from "@/lib/env";

/** What the client sends with a batch upload. */
export const batchUploadInput = z.object({
  /** the study the batch belongs to (slug) */
  studySlug: z.string().min(1, "Choose a study."),
  /** public id of an existing batch when this upload is a new version of it */
  batchId: z.string().min(1).optional(),
  /** a label the provider gives the batch (first version only) */
  label: z.string().max(200).optional(),
  /** the file is the batch's latest version with these fix proposals applied (issue 12) */
  fixes: z
    .object({
      fromVersion: z.number().int().positive(),
      proposals: z.array(z.string().min(1).max(200)).min(1).max(50),
      confirmedSentinels: z
        .array(z.object({ column: z.string().min(1).max(200), value: z.number().finite() }))
        .max(50)
        .optional(),
    })
    .optional(),
});
export type BatchUploadInput = z.infer<typeof batchUploadInput>;

/** The stored file as the SDK reports it to `onUploadComplete`. */
export type UploadedBatchFile = {
  key: string;
  name: string;
  size: number;
  type: string;
  /** md5 of the bytes (hex), computed by the upload service */
  fileHash: string;
  ufsUrl: string;
  customId: string | null;
};

/** Metadata the middleware returns; it travels to `onUploadComplete` unchanged. */
export type BatchUploadMeta = Record<string, string | number | boolean | null>;

export type FileRouterHooks<M extends BatchUploadMeta> = {
  /** Session and role checks. Throw `UploadThingError` (or any Error) to refuse. */
  authorise(
    req: Request,
    input: BatchUploadInput,
    files: readonly { name: string; size: number }[],
  ): Promise<M> | M;
  /** Records the upload; what it returns reaches the client as `serverData`. */
  onComplete(meta: M, file: UploadedBatchFile): Promise<Record<string, string | number | boolean | null>>;
  /** Upload size limit in MB; default MAX_UPLOAD_MB or 200. */
  maxUploadMb?: number;
};

/** MIME types accepted for a batch: CSV, tab-separated and plain text (and the type some systems give .csv files). */
export const BATCH_FILE_TYPES = [
  "text/csv",
  "text/tab-separated-values",
  "text/plain",
  "application/vnd.ms-excel",
] as const;

function maxSize(mb: number | undefined): `${number}MB` {
  const n = mb ?? Number(rawSetting("MAX_UPLOAD_MB") ?? 200);
  if (!Number.isFinite(n) || n <= 0) throw new Error("MAX_UPLOAD_MB must be a positive number.");
  return `${Math.floor(n)}MB`;
}

const APP_CODES: Record<string, "FORBIDDEN" | "NOT_FOUND" | "BAD_REQUEST"> = {
  unauthenticated: "FORBIDDEN",
  forbidden: "FORBIDDEN",
  not_found: "NOT_FOUND",
  invalid: "BAD_REQUEST",
  conflict: "BAD_REQUEST",
};

/**
 * Refusals from `authorise` (an UploadThingError, or an error whose `code` is one of
 * the app's error codes) keep their message for the client; anything else is logged
 * and reported without internals.
 */
function toUploadError(e: unknown): UploadThingError {
  if (e instanceof UploadThingError) return e;
  const code =
    typeof (e as { code?: unknown })?.code === "string" ? APP_CODES[(e as { code: string }).code] : undefined;
  if (code) return new UploadThingError({ code, message: (e as Error).message });
  console.error("upload middleware failed", e);
  return new UploadThingError({
    code: "INTERNAL_SERVER_ERROR",
    message: "The upload could not be started. Try again.",
  });
}

/**
 * Builds the file router with one route, `batchFile`: one file per upload, private
 * (downloads need a signed URL), stored as an attachment.
 */
export function makeFileRouter<M extends BatchUploadMeta>(hooks: FileRouterHooks<M>) {
  const f = createUploadthing();
  const size = maxSize(hooks.maxUploadMb) as "256MB";
  const one = {
    maxFileSize: size,
    maxFileCount: 1,
    acl: "private",
    contentDisposition: "attachment",
  } as const;
  return {
    batchFile: f(
      Object.fromEntries(BATCH_FILE_TYPES.map((t) => [t, one])) as Record<
        (typeof BATCH_FILE_TYPES)[number],
        typeof one
      >,
      // a random part makes keys unpredictable (the default hashes name, size and time)
      { awaitServerData: true, getFileHashParts: (file) => [file.name, file.size, crypto.randomUUID()] },
    )
      .input(batchUploadInput)
      .middleware(async ({ req, input, files }) => {
        try {
          return await hooks.authorise(req, input, files);
        } catch (e) {
          throw toUploadError(e);
        }
      })
      .onUploadComplete(async ({ metadata, file }) => {
        return hooks.onComplete(metadata as unknown as M, {
          key: file.key,
          name: file.name,
          size: file.size,
          type: file.type,
          fileHash: file.fileHash,
          ufsUrl: file.ufsUrl,
          customId: file.customId,
        });
      }),
  } satisfies FileRouter;
}

export type BatchFileRouter = ReturnType<typeof makeFileRouter>;
