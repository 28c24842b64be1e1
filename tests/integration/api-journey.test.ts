/**
 * The whole journey through the API alone, each person with a personal token: a provider
 * uploads (the file goes through the SDK to the upload-service fake), the worker's own job code
 * checks it, the analyst bounces with two finding comments, the provider's e-mail is in the
 * outbox, the provider uploads version 2, the analyst accepts it, and the lead reads the board
 * and the pool, where the accepted version now is.
 */
import { afterAll, beforeAll, expect, test } from "vitest";
import { and, desc, eq } from "drizzle-orm";
import os from "node:os";
import path from "node:path";
import { mkdtemp, rm } from "node:fs/promises";
import { getDb, getPool } from "@/db/client";
import { emailOutbox, users } from "@/db/schema";
import { startUploadFake, parseUploadToken } from "@/fakes/upload-service";
import { barleyBatches } from "@/lib/demo/batches";
import { claimJob } from "@/lib/batches/jobs/check-jobs";
import { runJob } from "@/lib/batches/jobs/worker";
import { openStoredFile } from "@/lib/batches/intake/file-store";
import { createApiToken } from "@/lib/people/commands-tokens";
import { POST as upload } from "@/app/api/v1/batches/route";
import { GET as getReport } from "@/app/api/v1/batches/[id]/versions/[version]/report/route";
import { POST as decide } from "@/app/api/v1/batches/[id]/versions/[version]/decision/route";
import { GET as getBoard } from "@/app/api/v1/board/route";
import { GET as getPoolOf } from "@/app/api/v1/pool/[slug]/route";
import { call } from "./helpers/api";
import { drainQueue } from "./helpers/pipeline";

const PROVIDER = "provider@fennick.test";
const STUDY = "barley-nitrogen";
let fake: Awaited<ReturnType<typeof startUploadFake>>;
let dir = "";
const tokens: Record<string, string> = {};

async function tokenFor(email: string): Promise<string> {
  const [u] = await getDb().select({ id: users.id }).from(users).where(eq(users.email, email));
  const r = await createApiToken(u!.id, { name: "journey" });
  if (!r.ok) throw new Error(r.message);
  return r.data.token;
}

/** POST /api/v1/batches with a token, then the worker's job for it: the report arrives. */
async function uploadAndCheck(csv: string, batch?: string): Promise<{ batchId: string; version: number }> {
  const form = new FormData();
  form.set("study", STUDY);
  if (batch) form.set("batch", batch);
  form.set("file", new File([csv], "fennick-plots.csv", { type: "text/csv" }));
  const req = new Request("http://127.0.0.1:3410/api/v1/batches", {
    method: "POST",
    headers: { authorization: `Bearer ${tokens.provider}` },
    body: form,
  });
  const res = await upload(req, { params: Promise.resolve({}) });
  expect(res.status).toBe(201);
  const { data } = (await res.json()) as { data: { batchId: string; version: number } };
  const db = getDb();
  const job = await claimJob(db, "journey-worker");
  await runJob({ db, openFile: (key) => openStoredFile(key) }, job!);
  return data;
}

type ReportAnswer = {
  state: string;
  report: { findings: { code: string; columns: string[] }[] } | null;
  decision: { decision: string; findingComments: unknown[] } | null;
};
const report = async (batchId: string, version: number, as: string) =>
  call(getReport, {
    path: `/api/v1/batches/${batchId}/versions/${version}/report`,
    params: { id: batchId, version: String(version) },
    as: { bearer: as },
  });
const decideAs = (batchId: string, version: number, body: unknown) =>
  call(decide, {
    method: "POST",
    path: `/api/v1/batches/${batchId}/versions/${version}/decision`,
    params: { id: batchId, version: String(version) },
    as: { bearer: tokens.analyst },
    body,
  });

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tributary-journey-"));
  const { apiKey } = parseUploadToken(process.env.UPLOADTHING_TOKEN!);
  fake = await startUploadFake({ port: 0, apiKey, dir });
  process.env.UPLOADTHING_API_URL = fake.url;
  process.env.UPLOADTHING_INGEST_URL = fake.url;
  tokens.provider = await tokenFor(PROVIDER);
  tokens.analyst = await tokenFor("analyst@lowmoor.test");
  tokens.lead = await tokenFor("lead@lowmoor.test");
  await drainQueue();
});

afterAll(async () => {
  await fake?.close();
  await rm(dir, { recursive: true, force: true });
  await getPool().end();
});

test("upload, report, bounce with two finding comments, e-mail, version 2, accept, board and pool", async () => {
  // a batch with defects (lib/demo/batches.ts: the demo's second barley farm file)
  const first = await uploadAndCheck(barleyBatches()[1]!.csv);
  const r1 = await report(first.batchId, 1, tokens.provider!);
  const v1 = r1.json.data as ReportAnswer;
  expect(v1.state).toBe("ready");
  const findings = v1.report!.findings;
  expect(findings.length).toBeGreaterThan(0);
  const [a, b] = [findings[0]!, findings[1] ?? findings[0]!];

  const bounced = await decideAs(first.batchId, 1, {
    decision: "bounce",
    comment: "Two things to fix before we can pool this.",
    findingComments: [
      { code: a.code, columns: a.columns, comment: "Fix these rows first." },
      { code: b.code, columns: b.columns, comment: "And check these against the field book." },
    ],
  });
  expect(bounced.status).toBe(201);
  expect(bounced.json.data).toMatchObject({ state: "bounced" });
  const after = (await report(first.batchId, 1, tokens.provider!)).json.data as ReportAnswer;
  expect(after.decision?.decision).toBe("bounce");
  expect(after.decision?.findingComments).toHaveLength(2);

  // the provider's mailbox: the bounce e-mail with both comments and the link to the version
  const [mail] = await getDb()
    .select({ subject: emailOutbox.subject, text: emailOutbox.textBody })
    .from(emailOutbox)
    .where(and(eq(emailOutbox.toAddress, PROVIDER), eq(emailOutbox.kind, "decision")))
    .orderBy(desc(emailOutbox.id))
    .limit(1);
  expect(mail?.text).toContain("Fix these rows first.");
  expect(mail?.text).toContain("And check these against the field book.");
  expect(mail?.text).toContain(`/batches/${first.batchId}?v=1`);

  // version 2: the clean file of the demo's first farm, as a new version of the same batch
  const second = await uploadAndCheck(barleyBatches()[0]!.csv, first.batchId);
  expect(second).toMatchObject({ batchId: first.batchId, version: 2 });
  expect(((await report(first.batchId, 2, tokens.analyst!)).json.data as ReportAnswer).state).toBe("ready");
  const accepted = await decideAs(first.batchId, 2, { decision: "accept" });
  expect(accepted.status).toBe(201);
  expect(accepted.json.data).toMatchObject({ state: "accepted" });

  const board = await call(getBoard, { path: "/api/v1/board", as: { bearer: tokens.lead } });
  expect(board.status).toBe(200);
  expect(JSON.stringify(board.json.data)).toContain(first.batchId);
  const pool = await call(getPoolOf, {
    path: `/api/v1/pool/${STUDY}`,
    params: { slug: STUDY },
    as: { bearer: tokens.lead },
  });
  expect(pool.status).toBe(200);
  const members = (pool.json.data as { members: { batchPublicId: string; version: number }[] }).members;
  expect(members.filter((m) => m.batchPublicId === first.batchId).map((m) => m.version)).toEqual([2]);
});
