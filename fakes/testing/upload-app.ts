/**
 * A stand-in app for tests of the upload path: the batch file router from lib/batches/intake/file-router.ts with
 * test hooks, the SDK's real route handler served on a random port, and the SDK's real
 * client (needs `installFetchXhr()` in Node).
 */
import { genUploader } from "uploadthing/client";
import { createRouteHandler } from "uploadthing/server";
import {
  makeFileRouter,
  type BatchFileRouter,
  type UploadedBatchFile,
} from "@/lib/batches/intake/file-router";
import { serveFetchHandler, type ServedHandler } from "./serve-fetch-handler";

export type Completed = { meta: Record<string, unknown>; file: UploadedBatchFile };

export type UploadResult = { key: string; ufsUrl: string; fileHash: string; serverData: unknown };

export type TestUploadApp = {
  served: ServedHandler;
  completed: Completed[];
  /** bodies of error hooks the upload service sent */
  uploadErrors: string[];
  upload(
    file: File,
    opts?: { user?: string; input?: { studySlug: string; label?: string } },
  ): Promise<UploadResult[]>;
};

/**
 * Only the user "provider-1" (header x-test-user) may upload; onUploadComplete records the
 * call and answers `{batchId, hashSeen}`, or throws when `failComplete` is set.
 */
export async function startTestUploadApp(opts: {
  token: string;
  ingestUrl: string;
  isDev: boolean;
  failComplete?: boolean;
}): Promise<TestUploadApp> {
  const completed: Completed[] = [];
  const uploadErrors: string[] = [];
  const router = makeFileRouter({
    maxUploadMb: 8,
    authorise(req, input) {
      const user = req.headers.get("x-test-user");
      if (user !== "provider-1")
        throw Object.assign(new Error("Only provider-1 may upload here."), { code: "forbidden" });
      return { uploader: user, study: input.studySlug };
    },
    async onComplete(meta, file) {
      if (opts.failComplete) throw new Error("recording the batch failed");
      completed.push({ meta, file });
      return { batchId: `b-${completed.length}`, hashSeen: file.fileHash };
    },
  });
  let handler: (r: Request) => Promise<Response> = async () => new Response("starting", { status: 503 });
  const served = await serveFetchHandler((r) => handler(r));
  const routeHandler = createRouteHandler({
    router,
    config: {
      token: opts.token,
      isDev: opts.isDev,
      ingestUrl: opts.ingestUrl,
      callbackUrl: `${served.url}/api/uploadthing`,
      logLevel: "Fatal",
    },
  });
  handler = async (r) => {
    // record error hooks before the SDK consumes the body
    if (r.headers.get("uploadthing-hook") === "error") uploadErrors.push(await r.clone().text());
    return routeHandler(r);
  };
  const uploader = genUploader<BatchFileRouter>({
    url: new URL(`${served.url}/api/uploadthing`),
    package: "tributary-test",
    fetch: globalThis.fetch,
  });
  return {
    served,
    completed,
    uploadErrors,
    upload: (file, o = {}) =>
      uploader.uploadFiles("batchFile", {
        files: [file],
        input: o.input ?? { studySlug: "barley-nitrogen" },
        headers: { "x-test-user": o.user ?? "provider-1" },
      }) as Promise<UploadResult[]>,
  };
}
