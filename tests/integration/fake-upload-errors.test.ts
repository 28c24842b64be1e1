/**
 * Failure paths of the upload path with the real SDK: the route refuses a file type it
 * does not accept, a PUT the app never registered is refused, and when the app's
 * onUploadComplete fails the client is told the upload failed (not left hanging).
 */
import { randomBytes } from "node:crypto";
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sign } from "@/fakes/upload/signing";
import { startUploadFake, type UploadFake } from "@/fakes/upload-service";
import { installFetchXhr } from "@/fakes/testing/fetch-xhr";
import { startTestUploadApp } from "@/fakes/testing/upload-app";

const apiKey = "sk_test_fake_errors_" + randomBytes(8).toString("hex");
const appId = "tributary-test";
const token = Buffer.from(JSON.stringify({ apiKey, appId, regions: ["local1"] })).toString("base64");

let dir: string;
let fake: UploadFake;
let prodFake: UploadFake;
let restoreXhr: () => void;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-upload-errors-"));
  fake = await startUploadFake({
    port: 0,
    apiKey,
    appId,
    dir,
    callbackTimeoutMs: 1500,
    registrationWaitMs: 300,
    log: () => {},
  });
  prodFake = await startUploadFake({
    port: 0,
    apiKey,
    appId,
    dir,
    callbackTimeoutMs: 20_000,
    callbackGraceMs: 300,
    log: () => {},
  });
  restoreXhr = installFetchXhr();
});

afterAll(async () => {
  restoreXhr?.();
  await fake?.close();
  await prodFake?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe("upload failures", () => {
  it("the batch route refuses a file type it does not accept", async () => {
    const app = await startTestUploadApp({ token, ingestUrl: fake.url, isDev: false });
    try {
      const png = new File([new Uint8Array([0x89, 0x50, 0x4e, 0x47])], "chart.png", { type: "image/png" });
      await expect(app.upload(png)).rejects.toThrow(/Invalid config|image/i);
      expect(app.completed).toEqual([]);
    } finally {
      await app.served.close();
    }
  });

  it("a PUT carrying a slug that no app registered is refused once the wait runs out", async () => {
    const u = new URL(`${fake.url}/neverRegistered${randomBytes(8).toString("hex")}`);
    u.searchParams.append("expires", String(Date.now() + 60_000));
    u.searchParams.append("x-ut-identifier", appId);
    u.searchParams.append("x-ut-file-size", "2");
    u.searchParams.append("x-ut-slug", "batchFile");
    u.searchParams.append("signature", sign(u.toString(), apiKey));
    const fd = new FormData();
    fd.append("file", new File(["a\n"], "a.csv", { type: "text/csv" }));
    const r = await fetch(u.href, { method: "PUT", headers: { range: "bytes=0-" }, body: fd });
    expect(r.status).toBe(400);
    expect(((await r.json()) as { error: string }).error).toMatch(/did not register this upload/);
  });

  it("an expired presigned URL is refused", async () => {
    const u = new URL(`${fake.url}/expiredUrl${randomBytes(8).toString("hex")}`);
    u.searchParams.append("expires", String(Date.now() - 1000));
    u.searchParams.append("x-ut-identifier", appId);
    u.searchParams.append("signature", sign(u.toString(), apiKey));
    const r = await fetch(u.href, { method: "HEAD" });
    expect(r.status).toBe(403);
  });

  it("when onUploadComplete fails in dev mode the client gets an error once the wait runs out", async () => {
    const app = await startTestUploadApp({ token, ingestUrl: fake.url, isDev: true, failComplete: true });
    try {
      const started = Date.now();
      await expect(app.upload(new File(["a,b\n1,2\n"], "x.csv", { type: "text/csv" }))).rejects.toThrow(
        /did not confirm recording the upload within 2 s/,
      );
      expect(Date.now() - started).toBeGreaterThanOrEqual(1400);
    } finally {
      await app.served.close();
    }
  });

  it("when onUploadComplete fails in production mode the client is told soon after the callback returns", async () => {
    const app = await startTestUploadApp({
      token,
      ingestUrl: prodFake.url,
      isDev: false,
      failComplete: true,
    });
    try {
      const started = Date.now();
      await expect(app.upload(new File(["a,b\n1,2\n"], "x.csv", { type: "text/csv" }))).rejects.toThrow(
        /could not record the upload \(onUploadComplete failed\)/,
      );
      // the grace (300 ms), well before the 20 s overall wait
      expect(Date.now() - started).toBeLessThan(10_000);
    } finally {
      await app.served.close();
    }
  });
});
