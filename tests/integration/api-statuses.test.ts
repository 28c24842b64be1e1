/**
 * HTTP as clients expect it: each status code of the v1 API by a real call, every refusal as
 * RFC 9457 problem details (`application/problem+json`, §3: type, title, status, detail,
 * instance) with a message that says what to fix. Statuses as RFC 9110 §15 defines them; 429
 * and Retry-After as RFC 6585 §4; Location on 201 as RFC 9110 §10.2.2.
 */
import { beforeAll, describe, expect, test } from "vitest";

// a small upload limit, so the over-limit file needs no large body; read at env()'s first use
process.env.MAX_UPLOAD_MB = "1";

import { POST as postBatch } from "@/app/api/v1/batches/route";
import { POST as decide } from "@/app/api/v1/batches/[id]/versions/[version]/decision/route";
import { POST as changePassword } from "@/app/api/v1/me/password/route";
import { POST as postToken } from "@/app/api/v1/tokens/route";
import { POST as postStudy } from "@/app/api/v1/studies/route";
import { barleyBatches } from "@/lib/demo/batches";
import { call } from "./helpers/api";
import { uploadAndCheck } from "./helpers/pipeline";
import { sessionCookieFor } from "./helpers/session";
import { addApiToken, createWorld, type World } from "./helpers/world";
import { cookieOf } from "./helpers/seeded";

let w: World;
let providerCookie = "";
let analystCookie = "";

/** Checks the problem-details shape (RFC 9457 §3.1) and answers the body. */
function expectProblem(res: { status: number; json: Record<string, unknown> }, status: number, code: string) {
  expect(res.status).toBe(status);
  expect(res.json).toMatchObject({ status, code, type: `tag:tributary,2026:problem:${code}` });
  expect(typeof res.json.title).toBe("string");
  expect(String(res.json.detail).length).toBeGreaterThan(20);
  expect(String(res.json.instance)).toMatch(/^\/api\/v1\//);
  return res.json;
}

async function upload(
  cookie: string,
  file: File,
): Promise<{ status: number; json: Record<string, unknown> }> {
  const form = new FormData();
  form.set("study", "barley-nitrogen");
  form.set("file", file);
  const req = new Request("http://127.0.0.1:3410/api/v1/batches", {
    method: "POST",
    headers: { cookie },
    body: form,
  });
  const res = await postBatch(req, { params: Promise.resolve({}) });
  expect(res.headers.get("content-type")).toMatch(/^application\/problem\+json/);
  return { status: res.status, json: (await res.json()) as Record<string, unknown> };
}

const demoCookie = cookieOf;

beforeAll(async () => {
  w = await createWorld();
  providerCookie = await demoCookie("provider@fennick.test");
  analystCookie = await demoCookie("analyst@lowmoor.test");
});

describe("status codes of the v1 API", () => {
  test("400: a body that is not JSON", async () => {
    const cookie = await sessionCookieFor(w.users.providerA);
    const res = await call(postToken, {
      method: "POST",
      path: "/api/v1/tokens",
      as: { cookie },
      body: "{name:",
    });
    const p = expectProblem(res, 400, "bad_request");
    expect(p.detail).toMatch(/not valid JSON/);
    expect(p.instance).toBe("/api/v1/tokens");
  });

  test("415: a JSON route sent another content type; an upload that is not CSV", async () => {
    const cookie = await sessionCookieFor(w.users.providerA);
    const res = await call(postToken, {
      method: "POST",
      path: "/api/v1/tokens",
      as: { cookie },
      body: "name=x",
      contentType: "application/x-www-form-urlencoded",
    });
    expect(expectProblem(res, 415, "unsupported_type").detail).toMatch(/Content-Type: application\/json/);
    const workbook = await upload(providerCookie, new File(["PK\u0003\u0004"], "plots.xlsx"));
    expect(expectProblem(workbook, 415, "unsupported_type").detail).toMatch(/not a CSV file/);
  });

  test("413: a file over the upload limit", async () => {
    const big = "a,b\n" + "1,2\n".repeat(300_000); // 1.2 MB against MAX_UPLOAD_MB=1
    const res = await upload(providerCookie, new File([big], "big.csv", { type: "text/csv" }));
    const p = expectProblem(res, 413, "too_large");
    expect(p.detail).toMatch(/1 MB/);
    expect((p.errors as Record<string, string[]>).file?.[0]).toMatch(/Split the batch/);
  });

  test("422: invalid input, with the fields named in `errors`", async () => {
    const cookie = await sessionCookieFor(w.users.lead);
    const res = await call(postStudy, {
      method: "POST",
      path: "/api/v1/studies",
      as: { cookie },
      body: { slug: "Not A Slug!", title: "x" },
    });
    const p = expectProblem(res, 422, "invalid");
    expect(Object.keys(p.errors as object).sort()).toEqual(["slug", "title"]);
  });

  test("201 with Location naming what was created", async () => {
    const cookie = await sessionCookieFor(w.users.lead);
    const slug = `statuses-${process.pid}`;
    const res = await call(postStudy, {
      method: "POST",
      path: "/api/v1/studies",
      as: { cookie },
      body: { slug, title: "Status codes study" },
    });
    expect(res.status).toBe(201);
    expect(res.headers.get("location")).toBe(`/api/v1/studies/${slug}`);
  });

  test("409: a decision on a decided version, and on a superseded one", async () => {
    const csv = barleyBatches()[1]!.csv;
    const v1 = await uploadAndCheck("provider@fennick.test", "barley-nitrogen", csv);
    const at = (v: number) => ({
      method: "POST",
      path: `/api/v1/batches/${v1.batchPublicId}/versions/${v}/decision`,
      params: { id: v1.batchPublicId, version: String(v) },
      as: { cookie: analystCookie },
      body: { decision: "bounce", comment: "Add the missing plots." },
    });
    const first = await call(decide, at(1));
    expect(first.status).toBe(201);
    expect(first.headers.get("location")).toBe(`/api/v1/batches/${v1.batchPublicId}/versions/1/report`);
    const again = await call(decide, at(1));
    expect(expectProblem(again, 409, "conflict").detail).toMatch(/already bounced by/);

    await uploadAndCheck("provider@fennick.test", "barley-nitrogen", csv, {
      batchPublicId: v1.batchPublicId,
    });
    await uploadAndCheck("provider@fennick.test", "barley-nitrogen", csv, {
      batchPublicId: v1.batchPublicId,
    });
    const stale = await call(decide, at(2));
    expect(expectProblem(stale, 409, "conflict").detail).toMatch(/superseded by version 3/);
  });

  test("429 with Retry-After: wrong current passwords past the limit (10 per 15 minutes)", async () => {
    const { token } = await addApiToken(w.users.analystB);
    const wrong = {
      method: "POST",
      path: "/api/v1/me/password",
      as: { bearer: token },
      body: { currentPassword: "not-the-password", newPassword: "another-long-password" },
    };
    for (let i = 0; i < 10; i++) expect((await call(changePassword, wrong)).status).toBe(422);
    const refused = await call(changePassword, wrong);
    expect(expectProblem(refused, 429, "rate_limited").detail).toMatch(/Try again in/);
    const retry = Number(refused.headers.get("retry-after"));
    expect(Number.isInteger(retry) && retry > 0 && retry <= 15 * 60).toBe(true);
  });
});
