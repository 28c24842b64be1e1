/**
 * The real pipeline for the security tests: the upload-service fake in-process (files are
 * private and read through signed URLs), uploads through POST /api/v1/batches, the check
 * run by the worker's runJob reading the stored file, and route handlers called as Next
 * calls them with a signed-in session cookie of a seeded user.
 */
import os from "node:os";
import path from "node:path";
import { mkdtemp, rm } from "node:fs/promises";
import { getDb } from "@/db/client";
import { parseUploadToken, startUploadFake, type UploadFake } from "@/fakes/upload-service";
import { claimJob } from "@/lib/batches/jobs/check-jobs";
import { runJob } from "@/lib/batches/jobs/worker";
import { openStoredFile } from "@/lib/batches/intake/file-store";
import { POST as uploadRoute } from "@/app/api/v1/batches/route";
import { drainQueue } from "./pipeline";

export type Handler<P> = (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;

let fake: UploadFake | null = null;
let dir = "";

/** Starts the upload fake and points the SDK at it (before anything reads the environment). */
export async function startFileStore(): Promise<UploadFake> {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-security-"));
  const { apiKey } = parseUploadToken(process.env.UPLOADTHING_TOKEN!);
  fake = await startUploadFake({ port: 0, apiKey, dir, log: () => {} });
  process.env.UPLOADTHING_API_URL = fake.url;
  process.env.UPLOADTHING_INGEST_URL = fake.url;
  return fake;
}

export async function stopFileStore(): Promise<void> {
  await fake?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
}

import { cookieOf } from "./seeded";

export { cookieOf };

/** Calls a route handler as `email` (anonymous when null). */
export async function callAs<P extends Record<string, string>>(
  handler: Handler<P>,
  url: string,
  params: P,
  email: string | null,
): Promise<Response> {
  const headers = new Headers();
  if (email) headers.set("cookie", await cookieOf(email));
  return handler(new Request(`http://127.0.0.1:3410${url}`, { headers }), {
    params: Promise.resolve(params),
  });
}

/** Uploads through POST /api/v1/batches as `email`; the answer's status and body. */
export async function apiUpload(
  email: string,
  fields: { study: string; file: File; label?: string; batch?: string },
  headers: Record<string, string> = {},
) {
  await drainQueue();
  const form = new FormData();
  form.append("study", fields.study);
  form.append("file", fields.file);
  if (fields.label !== undefined) form.append("label", fields.label);
  if (fields.batch !== undefined) form.append("batch", fields.batch);
  const res = await uploadRoute(
    new Request("http://127.0.0.1:3410/api/v1/batches", {
      method: "POST",
      headers: { ...headers, cookie: await cookieOf(email) },
      body: form,
    }),
    { params: Promise.resolve({}) },
  );
  return {
    status: res.status,
    headers: res.headers,
    body: (await res.json()) as {
      data?: { batchId: string; version: number };
      code?: string;
      detail?: string;
    },
  };
}

/** Runs the queued check with the worker's code, reading the file from the store. */
export async function runNextCheck() {
  const job = await claimJob(getDb(), "security-test-worker");
  if (!job) throw new Error("no check job queued");
  return runJob({ db: getDb(), openFile: (k) => openStoredFile(k) }, job);
}

/** Upload and check; throws unless the upload was taken. */
export async function uploadChecked(
  email: string,
  fields: { study: string; file: File; label?: string; batch?: string },
) {
  const up = await apiUpload(email, fields);
  if (up.status !== 201 || !up.body.data)
    throw new Error(`upload refused: ${up.status} ${JSON.stringify(up.body)}`);
  const report = await runNextCheck();
  return { batchId: up.body.data.batchId, version: up.body.data.version, report };
}
