/**
 * The OpenAPI document (GET /api/v1/openapi.json, lib/http/openapi.ts): it passes a standard
 * OpenAPI 3.1 validator (@seriousme/openapi-schema-validator, which checks against the
 * specification's published JSON Schema); every v1 route of the README's "Who may call what"
 * table has its path and method in it, and it names no route the table lacks; and real answers
 * — GET /api/v1/me for every role, and refusals of several kinds — validate against the
 * document's own schemas (ajv, JSON Schema 2020-12, the dialect of OpenAPI 3.1).
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { Validator } from "@seriousme/openapi-schema-validator";
import Ajv2020 from "ajv/dist/2020";
import { beforeAll, describe, expect, test } from "vitest";
import { GET as getOpenApi } from "@/app/api/v1/openapi.json/route";
import { GET as getMe } from "@/app/api/v1/me/route";
import { GET as getBatch } from "@/app/api/v1/batches/[id]/route";
import { GET as getAudit } from "@/app/api/v1/audit/route";
import { call } from "./helpers/api";
import { sessionCookieFor } from "./helpers/session";
import { addApiToken, createWorld, type World } from "./helpers/world";

type Doc = {
  paths: Record<
    string,
    Record<string, { responses: Record<string, { content?: Record<string, { schema: unknown }> }> }>
  >;
  components: { schemas: Record<string, unknown> };
};

const ROOT = path.resolve(import.meta.dirname, "../..");
let w: World;
let doc: Doc;

beforeAll(async () => {
  w = await createWorld();
  const res = await getOpenApi();
  expect(res.status).toBe(200);
  doc = (await res.json()) as Doc;
});

/** The schema of an answer, with the document's components so that $refs resolve. */
function validatorFor(p: string, method: string, status: number) {
  // refusals are RFC 9457 problem details, with their own media type (§6.1)
  const media = status >= 400 ? "application/problem+json" : "application/json";
  const schema = doc.paths[p]?.[method]?.responses[String(status)]?.content?.[media]?.schema;
  expect(schema, `${method.toUpperCase()} ${p} ${status} has a JSON schema`).toBeDefined();
  const ajv = new Ajv2020({ strict: false });
  ajv.addSchema({ $id: "doc", components: doc.components });
  const rewritten = JSON.parse(JSON.stringify(schema).replaceAll('"#/components/', '"doc#/components/'));
  return ajv.compile(rewritten);
}

describe("the OpenAPI document", () => {
  test("is valid OpenAPI 3.1", async () => {
    const result = await new Validator().validate(doc as unknown as Parameters<Validator["validate"]>[0]);
    expect(result.errors ?? []).toEqual([]);
    expect(result.valid).toBe(true);
    expect((doc as unknown as { openapi: string }).openapi).toBe("3.1.0");
  });

  test("has every v1 route of the README's table, and no other", () => {
    const readme = readFileSync(path.join(ROOT, "README.md"), "utf8");
    const start = readme.indexOf("## Who may call what");
    const rows = [
      ...readme.slice(start).matchAll(/^\| `(GET|POST|PATCH|PUT|DELETE) (\/api\/v1\/[^`]*)` *\|/gm),
    ].map((m) => `${m[1]!.toLowerCase()} ${m[2]!.replace(/\[(\w+)\]/g, "{$1}")}`);
    expect(rows.length).toBeGreaterThan(20);
    const inDoc = Object.entries(doc.paths).flatMap(([p, methods]) =>
      Object.keys(methods).map((m) => `${m} ${p}`),
    );
    expect(new Set(inDoc)).toEqual(new Set(rows));
  });

  test("GET /api/v1/me's real answers, for every role and by token, validate against its schema", async () => {
    const validate = validatorFor("/api/v1/me", "get", 200);
    for (const u of Object.values(w.users)) {
      const bySession = await call(getMe, { path: "/api/v1/me", as: { cookie: await sessionCookieFor(u) } });
      expect(bySession.status).toBe(200);
      expect(validate(bySession.json), JSON.stringify(validate.errors)).toBe(true);
    }
    const { token } = await addApiToken(w.users.providerA);
    const byToken = await call(getMe, { path: "/api/v1/me", as: { bearer: token } });
    expect(validate(byToken.json), JSON.stringify(validate.errors)).toBe(true);
    // the schema is not a rubber stamp: a changed answer fails it
    expect(validate({ data: { ...(byToken.json.data as object), role: "owner" } })).toBe(false);
  });

  test("refusals (401, 404, 422) validate against the error schema of their operation", async () => {
    const anonymous = await call(getMe, { path: "/api/v1/me" });
    expect(anonymous.status).toBe(401);
    expect(validatorFor("/api/v1/me", "get", 401)(anonymous.json)).toBe(true);

    const cookie = await sessionCookieFor(w.users.providerA);
    const missing = await call(getBatch, {
      path: "/api/v1/batches/nope",
      params: { id: "nope" },
      as: { cookie },
    });
    expect(missing.status).toBe(404);
    expect(validatorFor("/api/v1/batches/{id}", "get", 404)(missing.json)).toBe(true);

    const lead = await sessionCookieFor(w.users.lead);
    const bad = await call(getAudit, { path: "/api/v1/audit?limit=100000", as: { cookie: lead } });
    expect(bad.status).toBe(422);
    const validate = validatorFor("/api/v1/audit", "get", 422);
    expect(validate(bad.json), JSON.stringify(validate.errors)).toBe(true);
    expect(validate({ type: "x", title: "x", status: 422, detail: "x", instance: "/", code: "teapot" })).toBe(
      false,
    );
  });
});
