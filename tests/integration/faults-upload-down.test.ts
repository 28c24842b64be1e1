/**
 * Fault: the upload service is down, or dies mid-upload. The app reaches the upload fake
 * through a switch on its address that can refuse connections (a stopped service) or cut
 * an upload mid-body. Through the API (POST /api/v1/batches) the provider gets a 503 saying
 * what happened, that nothing was recorded, and to try again. Through the browser route
 * (the app's /api/uploadthing handler, driven by the SDK's own client) the route admits the
 * upload and the browser's transfer to the service fails (its failed registration with the
 * service is only logged by the SDK); the app is never called back, so it records nothing.
 * Either way no batch, version, check job or audit row is written, no file is kept, and once
 * the service is back the same upload goes through and is recorded once.
 */
import { mkdtemp, readdir, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq, sql } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { auditEvents, batches, batchVersions, checkJobs, users } from "@/db/schema";
import { parseUploadToken, startUploadFake, type UploadFake } from "@/fakes/upload-service";
import { installFetchXhr } from "@/fakes/testing/fetch-xhr";
import { serveFetchHandler, type ServedHandler } from "@/fakes/testing/serve-fetch-handler";
import { loadSessionUser, type SessionUser } from "@/lib/auth/load-user";
import { createApiToken } from "@/lib/people/commands-tokens";
import { startServiceSwitch, type ServiceSwitch } from "./helpers/faults-net";
import { STORE_DOWN_MESSAGE, uploadErrorMessage } from "@/lib/batches/intake/upload-errors";

// the browser route reads the signed-in user from next-auth; here it is the provider of the test
const signedIn = vi.hoisted(() => ({ user: null as SessionUser | null }));
vi.mock("@/lib/auth/session", () => ({ getCurrentUser: async () => signedIn.user }));

const { POST: apiPost } = await import("@/app/api/v1/batches/route");
const uploadRoute = await import("@/app/api/uploadthing/route");
const { genUploader } = await import("uploadthing/client");

const token = process.env.UPLOADTHING_TOKEN!;
const CSV = "plot_id,yield_t_ha\nHG-001,6.1\nHG-002,5.8\n".repeat(2_000);
let dir = "";
let fake: UploadFake;
let service: ServiceSwitch;
let app: ServedHandler;
let apiToken = "";
let restoreXhr: () => void = () => undefined;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-faults-upload-"));
  fake = await startUploadFake({ port: 0, apiKey: parseUploadToken(token).apiKey, dir, log: () => {} });
  service = await startServiceSwitch(fake.url);
  // the app's upload client and the SDK's route read these at first use
  process.env.UPLOADTHING_API_URL = service.url;
  process.env.UPLOADTHING_INGEST_URL = service.url;
  app = await serveFetchHandler((req) => uploadRoute.POST(req as never));
  process.env.UPLOADTHING_CALLBACK_URL = `${app.url}/api/uploadthing`;
  restoreXhr = installFetchXhr();
  const [u] = await getDb()
    .select({ id: users.id })
    .from(users)
    .where(eq(users.email, "provider@harrowgate.test"));
  signedIn.user = await loadSessionUser(u!.id);
  const t = await createApiToken(u!.id, { name: "upload fault test" });
  if (!t.ok) throw new Error(t.message);
  apiToken = t.data.token;
});

afterAll(async () => {
  restoreXhr();
  await app?.close();
  await service?.close().catch(() => undefined);
  await fake?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
  await getPool().end();
});

/** Rows an upload would write, counted; audit rows about batches and versions only. */
async function counts() {
  const n = async (q: Promise<{ n: number }[]>) => Number((await q)[0]!.n);
  const db = getDb();
  return {
    batches: await n(db.select({ n: sql<number>`count(*)` }).from(batches)),
    versions: await n(db.select({ n: sql<number>`count(*)` }).from(batchVersions)),
    jobs: await n(db.select({ n: sql<number>`count(*)` }).from(checkJobs)),
    audit: await n(
      db
        .select({ n: sql<number>`count(*)` })
        .from(auditEvents)
        .where(sql`${auditEvents.action} like 'batch.%'`),
    ),
  };
}

const storedFiles = async () => (await readdir(dir)).filter((f) => f.endsWith(".bin")).length;

function apiUpload(name: string): Promise<Response> {
  const form = new FormData();
  form.append("study", "barley-nitrogen");
  form.append("file", new File([CSV], name, { type: "text/csv" }));
  const req = new Request("http://127.0.0.1:3410/api/v1/batches", {
    method: "POST",
    headers: { authorization: `Bearer ${apiToken}` },
    body: form,
  });
  return apiPost(req, { params: Promise.resolve({}) });
}

async function expectUnavailable(res: Response): Promise<void> {
  expect(res.status).toBe(503);
  const body = (await res.json()) as { code: string; detail: string };
  expect(body.code).toBe("unavailable");
  // what happened, that nothing was kept, what to do — and no internals
  expect(body.detail).toMatch(/file store could not be reached, or it broke off the upload/i);
  expect(body.detail).toMatch(/Nothing was recorded/);
  expect(body.detail).toMatch(/try again/i);
  expect(body.detail).not.toMatch(/ECONN|127\.0\.0\.1|stack|UploadThing/i);
}

describe("the upload service down during an upload through the API", () => {
  it("refused connections: 503 with a clear message, nothing recorded; the same upload works once the service is back", async () => {
    const before = await counts();
    const filesBefore = await storedFiles();
    await service.down();
    try {
      await expectUnavailable(await apiUpload("while-down.csv"));
    } finally {
      await service.up();
    }
    expect(await counts()).toEqual(before);
    expect(await storedFiles()).toBe(filesBefore);

    const again = await apiUpload("while-down.csv");
    expect(again.status).toBe(201);
    expect(await counts()).toEqual({
      batches: before.batches + 1,
      versions: before.versions + 1,
      jobs: before.jobs + 1,
      audit: before.audit + 2,
    });
  });

  it("the connection cut mid-upload: 503 with the same message, nothing recorded, no file kept", async () => {
    const before = await counts();
    const filesBefore = await storedFiles();
    service.dropPutsAfter = 16 * 1024;
    try {
      await expectUnavailable(await apiUpload("cut-off.csv"));
    } finally {
      service.dropPutsAfter = null;
    }
    expect(service.dropped).toBeGreaterThanOrEqual(1);
    expect(await counts()).toEqual(before);
    expect(await storedFiles()).toBe(filesBefore);
  });
});

describe("the upload service down during an upload through the browser route", () => {
  // the SDK's browser client against the app's route handler: the route admits the upload and
  // hands out a signed address; the browser then sends the file to the service itself
  const send = (name: string) =>
    (
      genUploader<never>({
        url: new URL(`${app.url}/api/uploadthing`),
        package: "tributary-faults",
        fetch: globalThis.fetch,
      }) as unknown as {
        uploadFiles: (
          slug: string,
          o: unknown,
        ) => Promise<{ serverData: { batchId?: string; version?: number } }[]>;
      }
    ).uploadFiles("batchFile", {
      files: [new File([CSV], name, { type: "text/csv" })],
      input: { studySlug: "barley-nitrogen" },
    });

  /** The upload fails for the browser; the app records nothing and the service keeps no file. */
  async function expectRefusedAndNothingRecorded(name: string): Promise<void> {
    const before = await counts();
    const filesBefore = await storedFiles();
    const e = await send(name).then(
      () => null,
      (x: unknown) => x as Error & { code?: string },
    );
    // a transport failure, not one of the app's refusals (those carry the app's own message):
    // the SDK's client gives FetchError when the service is unreachable, UPLOAD_FAILED when cut
    expect(e).not.toBeNull();
    expect([e!.name, e!.code]).toSatisfy(([n, c]) => n === "FetchError" || c === "UPLOAD_FAILED");
    // and the upload form turns either into the API's wording (lib/batches/intake/upload-errors.ts)
    expect(uploadErrorMessage(e!)).toBe(STORE_DOWN_MESSAGE);
    // the React hook reports a store it could not reach as this code and text (@uploadthing/react)
    expect(
      uploadErrorMessage({
        code: "INTERNAL_CLIENT_ERROR",
        message: "Something went wrong. Please report this to UploadThing.",
      }),
    ).toBe(STORE_DOWN_MESSAGE);
    // while the app's own refusals keep their message
    expect(
      uploadErrorMessage({
        code: "NOT_FOUND",
        message: "This study does not exist or your organisation is not admitted to it.",
      }),
    ).toMatch(/not admitted/);
    // the service may still answer the cut upload late: give it the time a callback would take
    await new Promise((r) => setTimeout(r, 500));
    expect(await counts()).toEqual(before);
    expect(await storedFiles()).toBe(filesBefore);
  }

  it("with the service down the upload fails and nothing is recorded", async () => {
    await service.down();
    try {
      await expectRefusedAndNothingRecorded("browser-down.csv");
    } finally {
      await service.up();
    }
  });

  it("with the upload cut mid-file it fails and nothing is recorded", async () => {
    const dropped = service.dropped;
    service.dropPutsAfter = 16 * 1024;
    try {
      await expectRefusedAndNothingRecorded("browser-cut.csv");
    } finally {
      service.dropPutsAfter = null;
    }
    expect(service.dropped).toBeGreaterThan(dropped);
  });

  it("once the service is back the same upload is stored and recorded once", async () => {
    const before = await counts();
    const [done] = await send("browser-back.csv");
    expect(done?.serverData).toMatchObject({ version: 1 });
    expect(done?.serverData.batchId).toEqual(expect.any(String));
    expect(await counts()).toEqual({
      batches: before.batches + 1,
      versions: before.versions + 1,
      jobs: before.jobs + 1,
      audit: before.audit + 2,
    });
  });
});
