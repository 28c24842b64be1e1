/**
 * Every list of the v1 API pages (lib/http/page.ts): with a small `limit`, following `next` to
 * the end collects every row exactly once, in the list's order, each page but the last full,
 * and each `next` also sent as an RFC 8288 Link header (§3: `<target>; rel="next"`). The
 * reference for the rows and their order is MariaDB's own ORDER BY over the same tables (plain SQL
 * written here, not the list queries), with rows made to tie on the first sort column so the
 * tie-breaker is exercised. A bad cursor answers 400 and a limit over the maximum 422, each with
 * a message saying what to send; real pages validate against the OpenAPI document's schemas.
 */
import Ajv2020 from "ajv/dist/2020";
import { sql } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { getDb } from "@/db/client";
import { auditEvents, batches, batchVersions, dataPlans, reports, users } from "@/db/schema";
import { GET as listBatches } from "@/app/api/v1/batches/route";
import { GET as listQueue } from "@/app/api/v1/queue/route";
import { GET as listAudit } from "@/app/api/v1/audit/route";
import { GET as listTokens } from "@/app/api/v1/tokens/route";
import { GET as listUsers } from "@/app/api/v1/admin/users/route";
import { GET as getOpenApi } from "@/app/api/v1/openapi.json/route";
import { call, type Caller } from "./helpers/api";
import { sessionCookieFor } from "./helpers/session";
import { addApiToken, createWorld, type World } from "./helpers/world";

type Handler = typeof listBatches;
type Row = Record<string, unknown>;

let w: World;
const TIE = new Date("2026-11-30T08:00:00.000Z");

/** Follows `next` from `path` to the last page; every page's rows, checking each page's shape on the way. */
async function walk(handler: Handler, path: string, as: Caller, limit: number): Promise<Row[][]> {
  const pages: Row[][] = [];
  let next: string | null = path;
  while (next) {
    const res = await call(handler, { path: next, as });
    expect(res.status, next).toBe(200);
    const body = res.json as { data: Row[]; next: string | null };
    pages.push(body.data);
    if (body.next) {
      expect(body.data.length).toBe(limit); // only the last page may be short
      expect(body.next).toMatch(/^\/api\/v1\//); // relative to the server, like Location
      // RFC 8288 §3: Link = "<" URI-Reference ">" *( ";" link-param ), here rel="next"
      expect(res.headers.get("link")).toBe(`<${body.next}>; rel="next"`);
    } else {
      expect(res.headers.get("link")).toBeNull();
    }
    expect(pages.length).toBeLessThan(100); // a cursor that never moves on would loop
    next = body.next;
  }
  return pages;
}

async function addBatch(
  studyId: number,
  organisationId: number,
  n: number,
  createdAt: Date,
  state = "ready",
) {
  const publicId = `pg${w.tag}${n}`;
  const [row] = await getDb()
    .insert(batches)
    .values({ publicId, studyId, organisationId, title: `Paged ${n}`, latestVersion: 1, createdAt })
    .$returningId();
  const [plan] = await getDb()
    .select({ id: dataPlans.id })
    .from(dataPlans)
    .where(sql`${dataPlans.studyId} = ${studyId}`);
  const [version] = await getDb()
    .insert(batchVersions)
    .values({
      batchId: row!.id,
      version: 1,
      planId: plan!.id,
      fileKey: `key-${publicId}`,
      fileUrl: `http://127.0.0.1:3411/f/key-${publicId}`,
      fileName: `${publicId}.csv`,
      fileSize: 10,
      state: state as "ready",
      stateChangedAt: createdAt,
    })
    .$returningId();
  return { batchId: row!.id, versionId: version!.id, planId: plan!.id, publicId };
}

beforeAll(async () => {
  w = await createWorld();
  // farm A's batches in study A: eleven more, five of them at one moment (the tie the id breaks)
  const made = [];
  for (let n = 0; n < 11; n++)
    made.push(await addBatch(w.studyA.id, w.farmA.id, n, n < 5 ? TIE : new Date(TIE.getTime() + n * 1000)));
  // a re-checked version has two reports: the queue still lists it once, with the newer one's counts
  for (const blockers of [7, 2])
    await getDb().insert(reports).values({
      batchVersionId: made[0]!.versionId,
      planId: made[0]!.planId,
      status: "checked",
      report: {},
      blockers,
      engineVersion: "test",
    });
  // ten audit events of one object, and three users of one name
  await getDb()
    .insert(auditEvents)
    .values(
      Array.from({ length: 10 }, (_, i) => ({
        action: "paging.test",
        objectType: "paging",
        objectId: w.tag,
        after: { i },
      })),
    );
  await getDb()
    .insert(users)
    .values(
      ["a", "b", "c"].map((k) => ({
        email: `same-${k}.${w.tag}@f3a.test`,
        name: `Same Name ${w.tag}`,
        role: "analyst" as const,
        passwordHash: "x",
      })),
    );
  for (let i = 0; i < 7; i++) await addApiToken(w.users.providerA);
  await getDb().execute(
    sql`UPDATE api_tokens SET created_at = ${"2026-11-30 08:00:00.000"} WHERE user_id = ${w.users.providerA.id} LIMIT 4`,
  );
});

/** Ids (or another column) of a plain SQL query, the reference order. */
async function reference(query: ReturnType<typeof sql>, column = "id"): Promise<unknown[]> {
  const [rows] = (await getDb().execute(query)) as unknown as [Row[]];
  return rows.map((r) => r[column]);
}

describe("following next collects every row once, in order", () => {
  test("GET /api/v1/batches, newest first by (created, id)", async () => {
    const as = { cookie: await sessionCookieFor(w.users.providerA) };
    const pages = await walk(listBatches, "/api/v1/batches?limit=3", as, 3);
    expect(pages.length).toBe(4); // 12 batches of farm A (the world's one and eleven), 3 a page
    const expected = await reference(
      sql`SELECT id FROM batches WHERE organisation_id = ${w.farmA.id} ORDER BY created_at DESC, id DESC`,
    );
    expect(pages.flat().map((b) => b.id)).toEqual(expected);
    // a filter is kept in next: only ready batches of study A, every page
    const ready = (
      await walk(listBatches, `/api/v1/batches?state=ready&studyId=${w.studyA.id}&limit=5`, as, 5)
    )
      .flat()
      .map((b) => b.id);
    expect(ready).toEqual(expected);
  });

  test("GET /api/v1/queue, longest waiting first by (state since, version id), one row per version", async () => {
    const as = { cookie: await sessionCookieFor(w.users.analystA) };
    const rows = (await walk(listQueue, "/api/v1/queue?limit=4", as, 4)).flat();
    const expected = await reference(
      sql`SELECT b.public_id FROM batches b JOIN batch_versions v ON v.batch_id = b.id AND v.version = b.latest_version
          WHERE b.study_id = ${w.studyA.id} AND v.state IN ('ready', 'unreadable', 'checking', 'received')
          ORDER BY v.state_changed_at, v.id`,
      "public_id",
    );
    expect(rows.map((r) => r.batchId)).toEqual(expected);
    expect(rows.find((r) => r.batchId === `pg${w.tag}0`)?.blockers).toBe(2);
  });

  test("GET /api/v1/audit, newest first by id, with its filter kept", async () => {
    const as = { cookie: await sessionCookieFor(w.users.lead) };
    const pages = await walk(listAudit, `/api/v1/audit?objectType=paging&objectId=${w.tag}&limit=4`, as, 4);
    expect(pages.map((p) => p.length)).toEqual([4, 4, 2]);
    const expected = await reference(
      sql`SELECT id FROM audit_events WHERE object_type = 'paging' AND object_id = ${w.tag} ORDER BY id DESC`,
    );
    expect(pages.flat().map((e) => e.id)).toEqual(expected);
  });

  test("GET /api/v1/tokens, newest first by (created, id)", async () => {
    const as = { cookie: await sessionCookieFor(w.users.providerA) };
    const rows = (await walk(listTokens, "/api/v1/tokens?limit=2", as, 2)).flat();
    const expected = await reference(
      sql`SELECT id FROM api_tokens WHERE user_id = ${w.users.providerA.id} ORDER BY created_at DESC, id DESC`,
    );
    expect(expected.length).toBe(7);
    expect(rows.map((t) => t.id)).toEqual(expected);
  });

  test("GET /api/v1/admin/users, by role (in ROLES' order), name, id", async () => {
    const as = { cookie: await sessionCookieFor(w.users.admin) };
    const rows = (await walk(listUsers, "/api/v1/admin/users?limit=7", as, 7)).flat();
    // MariaDB sorts an ENUM by its place in the definition (provider, analyst, lead, admin)
    const expected = await reference(sql`SELECT id FROM users ORDER BY role, name, id`);
    expect(rows.map((u) => u.id)).toEqual(expected);
    expect(new Set(rows.map((u) => u.id)).size).toBe(rows.length);
    expect(rows.filter((u) => u.name === `Same Name ${w.tag}`).length).toBe(3);
  });
});

describe("bad paging input says what to send", () => {
  test("a cursor that is not one the list gave out answers 400", async () => {
    const as = { cookie: await sessionCookieFor(w.users.admin) };
    const tokenPage = await call(listTokens, { path: "/api/v1/tokens?limit=1", as });
    const tokenCursor = new URL(`http://x${(tokenPage.json as { next: string }).next}`).searchParams.get(
      "cursor",
    );
    for (const cursor of ["nonsense!", "bm90IGpzb24", tokenCursor]) {
      const res = await call(listBatches, { path: `/api/v1/batches?cursor=${cursor}`, as });
      expect(res.status).toBe(400);
      expect(res.json.code).toBe("bad_request");
      expect(res.json.detail).toMatch(/Follow the `next` address of the previous page unchanged/);
    }
  });

  test("a limit over the maximum, or not a whole number, answers 422 naming the range", async () => {
    const as = { cookie: await sessionCookieFor(w.users.admin) };
    for (const [handler, path] of [
      [listBatches, "/api/v1/batches?limit=501"],
      [listQueue, "/api/v1/queue?limit=0"],
      [listAudit, "/api/v1/audit?limit=9999"],
      [listTokens, "/api/v1/tokens?limit=many"],
      [listUsers, "/api/v1/admin/users?limit=2.5"],
    ] as const) {
      const res = await call(handler as Handler, { path, as });
      expect(res.status, path).toBe(422);
      expect(res.json.detail).toContain("limit is a whole number from 1 to 500");
      expect(res.json.errors?.limit).toBeDefined();
    }
  });
});

test("real pages validate against the OpenAPI document's schemas (JSON Schema 2020-12)", async () => {
  const doc = (await (await getOpenApi()).json()) as {
    paths: Record<
      string,
      { get: { responses: Record<string, { content: Record<string, { schema: unknown }> }> } }
    >;
    components: unknown;
  };
  const ajv = new Ajv2020({ strict: false });
  // RFC 3339 §5.6 date-time, the format JSON Schema's "date-time" names
  ajv.addFormat("date-time", /^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d(\.\d+)?(Z|[+-]\d\d:\d\d)$/i);
  ajv.addSchema({ $id: "doc", components: doc.components });
  const admin = { cookie: await sessionCookieFor(w.users.admin) };
  for (const [handler, path, doc_path, as] of [
    [listBatches, "/api/v1/batches?limit=2", "/api/v1/batches", admin],
    [listQueue, "/api/v1/queue?limit=2", "/api/v1/queue", admin],
    [listAudit, "/api/v1/audit?limit=2", "/api/v1/audit", admin],
    [
      listTokens,
      "/api/v1/tokens?limit=2",
      "/api/v1/tokens",
      { cookie: await sessionCookieFor(w.users.providerA) },
    ],
    [listUsers, "/api/v1/admin/users?limit=2", "/api/v1/admin/users", admin],
  ] as const) {
    const schema = doc.paths[doc_path]!.get.responses["200"]!.content["application/json"]!.schema;
    const validate = ajv.compile(
      JSON.parse(JSON.stringify(schema).replaceAll('"#/components/', '"doc#/components/')),
    );
    const res = await call(handler as Handler, { path, as });
    expect(validate(res.json), `${path}: ${JSON.stringify(validate.errors)}`).toBe(true);
    expect((res.json as { data: unknown[] }).data.length).toBe(2);
  }
});
