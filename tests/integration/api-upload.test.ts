/**
 * Upload through the API with a personal token, against the upload-service fake started
 * in-process: the file is stored through the SDK, recorded, checked by the worker, and the
 * report equals the one the browser path produces for the same bytes. Refusals store nothing.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import os from "node:os";
import path from "node:path";
import { mkdtemp, readdir, rm } from "node:fs/promises";
import { getDb, getPool } from "@/db/client";
import { batchVersions, studies, users } from "@/db/schema";
import { startUploadFake, parseUploadToken } from "@/fakes/upload-service";
import { barleyBatches } from "@/lib/demo/batches";
import { claimJob } from "@/lib/batches/jobs/check-jobs";
import { runJob } from "@/lib/batches/jobs/worker";
import { createApiToken, revokeApiToken } from "@/lib/people/commands-tokens";
import { openStoredFile } from "@/lib/batches/intake/file-store";
import { POST } from "@/app/api/v1/batches/route";
import { drainQueue, uploadAndCheck } from "./helpers/pipeline";

// the database client reads the environment at first use: only after beforeAll has pointed the SDK at the fake
const db = new Proxy({} as ReturnType<typeof getDb>, { get: (_t, k) => Reflect.get(getDb(), k) });
let fake: Awaited<ReturnType<typeof startUploadFake>>;
let dir = "";

async function tokenFor(email: string): Promise<{ token: string; id: number }> {
  const [u] = await db.select({ id: users.id }).from(users).where(eq(users.email, email));
  const r = await createApiToken(u!.id, { name: `upload test ${Date.now()}` });
  if (!r.ok) throw new Error(r.message);
  return { token: r.data.token, id: r.data.id };
}

function post(token: string | null, fields: Record<string, string | File>): Promise<Response> {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  const headers = new Headers();
  if (token) headers.set("authorization", `Bearer ${token}`);
  return POST(new Request("http://127.0.0.1:3410/api/v1/batches", { method: "POST", headers, body: form }), {
    params: Promise.resolve({}),
  });
}

const storedCount = async () =>
  (await readdir(dir).catch(() => [] as string[])).filter((n) => !n.endsWith(".json")).length;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-api-upload-"));
  const { apiKey } = parseUploadToken(process.env.UPLOADTHING_TOKEN!);
  fake = await startUploadFake({ port: 0, apiKey, dir });
  // the SDK reads these at first use (lib/batches/intake/file-store.ts caches its UTApi, lib/env its parse)
  process.env.UPLOADTHING_API_URL = fake.url;
  process.env.UPLOADTHING_INGEST_URL = fake.url;
  // a small limit, so the over-limit case needs no large file
  process.env.MAX_UPLOAD_MB = "1";
});

afterAll(async () => {
  await fake?.close();
  await rm(dir, { recursive: true, force: true });
  await getPool().end();
});

describe("POST /api/v1/batches", () => {
  it("stores, records and checks a file sent with a token; the report equals the browser path's", async () => {
    const csv = barleyBatches()[1]!.csv;
    const { token } = await tokenFor("provider@fennick.test");
    await drainQueue();
    const res = await post(token, {
      study: "barley-nitrogen",
      label: "Fennick by API",
      file: new File([csv], "fennick.csv", { type: "text/csv" }),
    });
    expect(res.status).toBe(201);
    const body = (await res.json()) as {
      data: { batchId: string; version: number; links: { report: string } };
    };
    expect(body.data.version).toBe(1);
    expect(body.data.links.report).toBe(`/api/v1/batches/${body.data.batchId}/versions/1/report`);
    // 201 names what it created (RFC 9110 §15.3.2)
    expect(res.headers.get("location")).toBe(body.data.links.report);

    const job = await claimJob(db, "api-test");
    expect(job?.fileName).toBe("fennick.csv");
    const viaApi = await runJob({ db, openFile: (key) => openStoredFile(key) }, job!);
    const viaBrowserPath = await uploadAndCheck("provider@fennick.test", "barley-nitrogen", csv);
    expect(viaApi?.status).toBe("checked");
    const shape = (r: typeof viaApi) => ({
      rows: r?.rows,
      counts: r?.counts,
      codes: r?.findings.map((f) => `${f.code}|${f.columns.join(",")}|${f.rowCount ?? f.rows.length}`),
      F: r?.fit?.F,
      coefficients: r?.fit?.coefficients.map((c) => c.estimate),
    });
    expect(shape(viaApi)).toEqual(shape(viaBrowserPath.report));
  });

  it("a revoked token is refused and nothing is stored", async () => {
    const { token, id } = await tokenFor("provider@fennick.test");
    const [u] = await db.select({ id: users.id }).from(users).where(eq(users.email, "provider@fennick.test"));
    const revoked = await revokeApiToken(u!.id, id);
    expect(revoked.ok).toBe(true);
    const before = await storedCount();
    const res = await post(token, { study: "barley-nitrogen", file: new File(["a,b\n1,2\n"], "x.csv") });
    expect(res.status).toBe(401);
    expect(((await res.json()) as { detail: string }).detail).toMatch(/revoked/);
    expect(await storedCount()).toBe(before);
  });

  it.each([
    [
      "a provider not admitted to the study",
      "installer@greenhearth.test",
      { study: "barley-nitrogen" },
      "x.csv",
      "a,b\n1,2\n",
      404,
      /not admitted/,
    ],
    [
      "an empty file",
      "provider@fennick.test",
      { study: "barley-nitrogen" },
      "empty.csv",
      "",
      422,
      /empty \(0 bytes\)/,
    ],
    [
      "a workbook",
      "provider@fennick.test",
      { study: "barley-nitrogen" },
      "plots.xlsx",
      "PK\u0003\u0004",
      415, // not the CSV asked for: RFC 9110 §15.5.16
      /not a CSV file/,
    ],
    [
      "an unknown study",
      "provider@fennick.test",
      { study: "no-such-study" },
      "x.csv",
      "a\n1\n",
      404,
      /does not exist/,
    ],
    [
      "a file over the size limit",
      "provider@fennick.test",
      { study: "barley-nitrogen" },
      "big.csv",
      "a,b\n" + "1,2\n".repeat(300_000),
      413, // RFC 9110 §15.5.14 Content Too Large
      /limit is 1 MB|1 MB limit/,
    ],
    [
      "an analyst (no upload permission)",
      "analyst@lowmoor.test",
      { study: "barley-nitrogen" },
      "x.csv",
      "a\n1\n",
      403,
      /role does not allow/,
    ],
  ])("refuses %s before storing anything", async (_what, email, fields, name, content, status, message) => {
    const { token } = await tokenFor(email);
    const before = await storedCount();
    const versionsBefore = (await db.select({ id: batchVersions.id }).from(batchVersions)).length;
    const res = await post(token, { ...fields, file: new File([content], name, { type: "text/csv" }) });
    expect(res.status).toBe(status);
    expect(((await res.json()) as { detail: string }).detail).toMatch(message);
    expect(await storedCount()).toBe(before);
    expect((await db.select({ id: batchVersions.id }).from(batchVersions)).length).toBe(versionsBefore);
  });

  it("refuses an upload to a closed study before storing anything", async () => {
    const { token } = await tokenFor("installer@greenhearth.test");
    await db.update(studies).set({ status: "closed" }).where(eq(studies.slug, "heat-pump-savings"));
    try {
      const before = await storedCount();
      const res = await post(token, { study: "heat-pump-savings", file: new File(["a\n1\n"], "x.csv") });
      expect(res.status).toBe(403);
      expect(((await res.json()) as { detail: string }).detail).toMatch(
        /is closed and takes no more batches/,
      );
      expect(await storedCount()).toBe(before);
    } finally {
      await db.update(studies).set({ status: "open" }).where(eq(studies.slug, "heat-pump-savings"));
    }
  });

  it("without credentials answers 401 JSON", async () => {
    const res = await post(null, { study: "barley-nitrogen", file: new File(["a\n1\n"], "x.csv") });
    expect(res.status).toBe(401);
  });
});
