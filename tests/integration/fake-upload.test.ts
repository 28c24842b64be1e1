/**
 * The upload-service fake against the real `uploadthing` SDK: the route handler from
 * `uploadthing/server`, the client from `uploadthing/client` (its XMLHttpRequest replaced
 * by a fetch-based stand-in) and `UTApi`, in dev mode (JSON-lines stream) and production
 * mode (signed callback POST). Expected hashes come from Node's md5 (RFC 1321), computed
 * independently of the fake over the bytes the test sent.
 */
import { createHash, randomBytes } from "node:crypto";
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { UTApi, UTFile } from "uploadthing/server";
import { sign } from "@/fakes/upload/signing";
import { startUploadFake, type UploadFake } from "@/fakes/upload-service";
import { installFetchXhr } from "@/fakes/testing/fetch-xhr";
import { startTestUploadApp, type TestUploadApp } from "@/fakes/testing/upload-app";
import { createUtapi, openStoredFile } from "@/lib/batches/intake/file-store";

const apiKey = "sk_test_fake_upload_" + randomBytes(8).toString("hex");
const appId = "tributary-test";
const token = Buffer.from(JSON.stringify({ apiKey, appId, regions: ["local1"] })).toString("base64");

const md5 = (b: Uint8Array | string) => createHash("md5").update(b).digest("hex");

async function bytesOf(stream: ReadableStream<Uint8Array>): Promise<Buffer> {
  const parts: Buffer[] = [];
  for await (const c of stream) parts.push(Buffer.from(c));
  return Buffer.concat(parts);
}

type TestApp = TestUploadApp;
const startApp = (f: UploadFake, isDev: boolean) => startTestUploadApp({ token, ingestUrl: f.url, isDev });

let dir: string;
let fake: UploadFake;
let api: UTApi;
let restoreXhr: () => void;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-upload-fake-"));
  fake = await startUploadFake({ port: 0, apiKey, appId, dir, callbackTimeoutMs: 10_000, log: () => {} });
  api = createUtapi({ token, apiUrl: fake.url, ingestUrl: fake.url });
  restoreXhr = installFetchXhr();
});

afterAll(async () => {
  restoreXhr?.();
  await fake?.close();
  if (dir) await rm(dir, { recursive: true, force: true });
});

const csv = "plot,block,nitrogen_kg_ha,yield_t_ha\n1,A,0,4.12\n2,A,60,5.37\n3,B,120,6.01\n";

describe.each([
  { mode: "dev (JSON-lines stream)", isDev: true },
  { mode: "production (signed callback POST)", isDev: false },
])("client upload in $mode", ({ isDev }) => {
  let app: TestApp;
  beforeAll(async () => {
    app = await startApp(fake, isDev);
  });
  afterAll(async () => app?.served.close());

  it("stores the file, runs onUploadComplete with the middleware metadata and returns serverData", async () => {
    const file = new File([csv], "harrowgate-2026.csv", { type: "text/csv" });
    const [res] = await app.upload(file, { input: { studySlug: "barley-nitrogen", label: "spring plots" } });
    expect(res).toBeDefined();
    expect(res!.fileHash).toBe(md5(csv));
    expect(res!.serverData).toEqual({ batchId: "b-1", hashSeen: md5(csv) });
    expect(app.completed).toHaveLength(1);
    expect(app.completed[0]!.meta).toEqual({ uploader: "provider-1", study: "barley-nitrogen" });
    expect(app.completed[0]!.file).toMatchObject({
      key: res!.key,
      name: "harrowgate-2026.csv",
      size: Buffer.byteLength(csv),
      type: "text/csv",
    });

    // the batch route stores privately: the plain URL is refused, a signed one works
    const plain = await fetch(res!.ufsUrl);
    expect(plain.status).toBe(403);
    await plain.body?.cancel();
    const bytes = await bytesOf(await openStoredFile(res!.key, { api }));
    expect(bytes.toString("utf8")).toBe(csv);
  });

  it("refuses an upload the middleware rejects, with its message, and stores nothing", async () => {
    const before = (await api.listFiles()).files.length;
    const file = new File(["a,b\n1,2\n"], "x.csv", { type: "text/csv" });
    await expect(app.upload(file, { user: "someone-else" })).rejects.toThrow(
      /Only provider-1 may upload here/,
    );
    expect((await api.listFiles()).files.length).toBe(before);
  });

  it("keeps binary-looking content and boundary-like lines intact across chunks (3 MiB)", async () => {
    const noise = randomBytes(3 * 1024 * 1024);
    // sprinkle CRLF and multipart-delimiter look-alikes through the body
    for (let i = 0; i < noise.length - 64; i += 65_537)
      noise.write("\r\n------WebKitFormBoundary\r\n--", i, "latin1");
    const file = new File([noise], "big.csv", { type: "text/csv" });
    const [res] = await app.upload(file);
    expect(res!.fileHash).toBe(md5(noise));
    const back = await bytesOf(await openStoredFile(res!.key, { api }));
    expect(back.length).toBe(noise.length);
    expect(back.equals(noise)).toBe(true);
  });
});

describe("signatures and the raw protocol", () => {
  let app: TestApp;
  beforeAll(async () => {
    app = await startApp(fake, false);
  });
  afterAll(async () => app?.served.close());

  /** Asks the app's route for presigned URLs the way the client does. */
  async function presign(name: string, size: number): Promise<{ url: string; key: string }> {
    const r = await fetch(`${app.served.url}/api/uploadthing?actionType=upload&slug=batchFile`, {
      method: "POST",
      headers: { "content-type": "application/json", "x-test-user": "provider-1" },
      body: JSON.stringify({
        files: [{ name, size, type: "text/csv", lastModified: Date.now() }],
        input: { studySlug: "barley-nitrogen" },
      }),
    });
    expect(r.status).toBe(200);
    const [p] = (await r.json()) as { url: string; key: string }[];
    return p!;
  }

  function form(content: string, name = "t.csv"): FormData {
    const fd = new FormData();
    fd.append("file", new File([content], name, { type: "text/csv" }));
    return fd;
  }

  it("answers HEAD with x-ut-range-start and CORS for the browser", async () => {
    const p = await presign("h.csv", 4);
    const pre = await fetch(p.url, {
      method: "OPTIONS",
      headers: { origin: "http://example.test", "access-control-request-method": "PUT" },
    });
    expect(pre.status).toBe(204);
    expect(pre.headers.get("access-control-allow-origin")).toBe("*");
    expect(pre.headers.get("access-control-allow-headers")).toContain("x-uploadthing-version");
    const head = await fetch(p.url, { method: "HEAD" });
    expect(head.status).toBe(200);
    expect(head.headers.get("x-ut-range-start")).toBe("0");
    expect(head.headers.get("access-control-expose-headers")).toContain("x-ut-range-start");
  });

  it("refuses a PUT whose signature or signed fields were altered (403)", async () => {
    const content = "a,b\n1,2\n";
    const p = await presign("s.csv", content.length);
    const sigAt = p.url.indexOf("&signature=");
    const flipped = p.url.slice(0, -1) + (p.url.endsWith("0") ? "1" : "0");
    const r1 = await fetch(flipped, { method: "PUT", headers: { range: "bytes=0-" }, body: form(content) });
    expect(r1.status).toBe(403);
    await r1.body?.cancel();
    // a bigger announced size under the original signature
    const resized =
      p.url.slice(0, sigAt).replace(/x-ut-file-size=\d+/, "x-ut-file-size=999999") + p.url.slice(sigAt);
    const r2 = await fetch(resized, { method: "PUT", headers: { range: "bytes=0-" }, body: form(content) });
    expect(r2.status).toBe(403);
    await r2.body?.cancel();
    const r3 = await fetch(p.url.slice(0, sigAt), {
      method: "PUT",
      headers: { range: "bytes=0-" },
      body: form(content),
    });
    expect(r3.status).toBe(403);
    await r3.body?.cancel();
    expect(await (await fetch(`${fake.url}/f/${p.key}`)).status).toBe(404);
  });

  it("refuses a file larger than announced and reports the error hook to the app", async () => {
    const p = await presign("short.csv", 5);
    const r = await fetch(p.url, { method: "PUT", headers: { range: "bytes=0-" }, body: form("0123456789") });
    expect(r.status).toBe(413);
    expect(((await r.json()) as { error: string }).error).toMatch(/larger than the 5 bytes/);
    expect(app.uploadErrors.some((t) => t.includes(p.key))).toBe(true);
    expect((await fetch(`${fake.url}/f/${p.key}`)).status).toBe(404);
  });

  it("refuses a second upload to the same key (409)", async () => {
    const content = "x,y\n3,4\n";
    const p = await presign("twice.csv", content.length);
    const first = await fetch(p.url, { method: "PUT", headers: { range: "bytes=0-" }, body: form(content) });
    expect(first.status).toBe(200);
    const body = (await first.json()) as { serverData: unknown; fileHash: string };
    expect(body.fileHash).toBe(md5(content));
    expect(body.serverData).toMatchObject({ hashSeen: md5(content) });
    const again = await fetch(p.url, { method: "PUT", headers: { range: "bytes=0-" }, body: form(content) });
    expect(again.status).toBe(409);
    await again.body?.cancel();
  });

  it("requires the api key on server endpoints (401)", async () => {
    const r = await fetch(`${fake.url}/v6/listFiles`, {
      method: "POST",
      headers: { "x-uploadthing-api-key": "sk_wrong" },
      body: "{}",
    });
    expect(r.status).toBe(401);
    await r.body?.cancel();
  });
});

describe("UTApi from Node", () => {
  it("uploadFiles stores a public file; getFileUrls, listFiles, signed access and deleteFiles work", async () => {
    const content = "site,kwh_before,kwh_after\nGH-01,14210,9120\n";
    const res = await api.uploadFiles(new UTFile([content], "greenhearth.csv", { type: "text/csv" }));
    expect(res.error).toBeNull();
    const data = res.data!;
    expect(data.fileHash).toBe(md5(content));
    expect(data.size).toBe(Buffer.byteLength(content));

    const direct = await fetch(data.ufsUrl);
    expect(direct.status).toBe(200);
    expect(await direct.text()).toBe(content);

    const urls = await api.getFileUrls(data.key);
    expect(urls.data).toEqual([{ key: data.key, url: data.ufsUrl }]);
    const listed = await api.listFiles();
    expect(listed.files.find((f) => f.key === data.key)).toMatchObject({
      name: "greenhearth.csv",
      status: "Uploaded",
    });

    const signed = await api.getSignedURL(data.key, { expiresIn: 60 });
    expect((await fetch(signed.ufsUrl)).status).toBe(200);

    const del = await api.deleteFiles(data.key);
    expect(del).toMatchObject({ success: true, deletedCount: 1 });
    expect((await fetch(data.ufsUrl)).status).toBe(404);
  });

  it("keeps a non-ASCII file name through the double-encoded query and serves it in Content-Disposition", async () => {
    const name = "Ærøskøbing høst 2026 (ét).csv";
    const res = await api.uploadFiles(new UTFile(["x\n1\n"], name, { type: "text/csv" }), {
      contentDisposition: "attachment",
    });
    expect((await api.listFiles()).files.find((f) => f.key === res.data!.key)?.name).toBe(name);
    const r = await fetch(res.data!.ufsUrl);
    // RFC 6266 / RFC 8187: the UTF-8 name percent-encoded in filename*
    expect(r.headers.get("content-disposition")).toBe(
      `attachment; filename="_r_sk_bing h_st 2026 (_t).csv"; filename*=UTF-8''${encodeURIComponent(name)}`,
    );
    await r.body?.cancel();
  });

  it("private files need a valid, unexpired signature", async () => {
    const content = "a\n1\n";
    const res = await api.uploadFiles(new UTFile([content], "p.csv", { type: "text/csv" }), {
      acl: "private",
    });
    const key = res.data!.key;
    expect((await fetch(res.data!.ufsUrl)).status).toBe(403);
    const { ufsUrl } = await api.generateSignedURL(key, { expiresIn: 60 });
    expect(ufsUrl).toContain(`/a/${appId}/${key}`);
    const ok = await fetch(ufsUrl);
    expect(ok.status).toBe(200);
    expect(await ok.text()).toBe(content);
    const tampered = ufsUrl.replace(/expires=(\d+)/, (_m, n: string) => `expires=${Number(n) + 1000}`);
    expect((await fetch(tampered)).status).toBe(403);
    // another key under this key's signature
    const other = await api.uploadFiles(new UTFile(["b\n2\n"], "q.csv", { type: "text/csv" }), {
      acl: "private",
    });
    expect((await fetch(ufsUrl.replace(key, other.data!.key))).status).toBe(403);
  });

  it("files survive a restart of the fake", async () => {
    const content = "kept,after\n1,restart\n";
    const res = await api.uploadFiles(new UTFile([content], "kept.csv", { type: "text/csv" }));
    await fake.close();
    fake = await startUploadFake({ port: 0, apiKey, appId, dir, log: () => {} });
    api = createUtapi({ token, apiUrl: fake.url, ingestUrl: fake.url });
    const back = await bytesOf(await openStoredFile(res.data!.key, { api }));
    expect(back.toString("utf8")).toBe(content);
  });
});

describe("ordering", () => {
  it("a PUT that arrives before the app's /route-metadata waits for it, then gets the app's serverData", async () => {
    const app = await startApp(fake, false);
    try {
      const key = "lateRegistration" + randomBytes(12).toString("hex");
      const content = "late\n1\n";
      // signed exactly as the SDK signs presigned URLs (values URI-encoded, then query-encoded)
      const u = new URL(`${fake.url}/${key}`);
      u.searchParams.append("expires", String(Date.now() + 60_000));
      for (const [k, v] of Object.entries({
        "x-ut-identifier": appId,
        "x-ut-file-name": "late.csv",
        "x-ut-file-size": String(content.length),
        "x-ut-file-type": "text/csv",
        "x-ut-slug": "batchFile",
        "x-ut-acl": "private",
      })) {
        u.searchParams.append(k, encodeURIComponent(v));
      }
      u.searchParams.append("signature", sign(u.toString(), apiKey));
      const fd = new FormData();
      fd.append("file", new File([content], "late.csv", { type: "text/csv" }));
      const put = fetch(u.href, { method: "PUT", headers: { range: "bytes=0-" }, body: fd });
      await new Promise((r) => setTimeout(r, 400));
      const reg = await fetch(`${fake.url}/route-metadata`, {
        method: "POST",
        headers: { "content-type": "application/json", "x-uploadthing-api-key": apiKey },
        body: JSON.stringify({
          fileKeys: [key],
          metadata: { uploader: "provider-1", study: "registered-late" },
          isDev: false,
          callbackUrl: `${app.served.url}/api/uploadthing`,
          callbackSlug: "batchFile",
          awaitServerData: true,
        }),
      });
      expect(await reg.json()).toEqual({ ok: true });
      const res = await put;
      expect(res.status).toBe(200);
      const body = (await res.json()) as { serverData: unknown; fileHash: string };
      expect(body.fileHash).toBe(md5(content));
      expect(body.serverData).toEqual({ batchId: "b-1", hashSeen: md5(content) });
      expect(app.completed[0]?.meta).toEqual({ uploader: "provider-1", study: "registered-late" });
    } finally {
      await app.served.close();
    }
  });
});
