/**
 * Pool export: the rows CSV streamed from the stored files re-reads to the pool's row count
 * with provenance columns and formula-safe cells; the data dictionary carries the plan and
 * the pool's figures; both are audited; refusals for anonymous callers, providers and
 * analysts of other studies.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, eq } from "drizzle-orm";
import Papa from "papaparse";
import { getDb, getPool } from "@/db/client";
import { auditEvents } from "@/db/schema";
import { barleyBatches } from "@/lib/demo/batches";
import { decideVersion } from "@/lib/batches/commands-decide";
import { uploadAndCheck, userId } from "./helpers/pipeline";
import { cookieOf, releaseScratchStudy, scratchStudy } from "./helpers/seeded";

vi.mock("server-only", () => ({}));
// the routes read stored files through the file store; here the files live in this process's memory
vi.mock("@/lib/batches/intake/file-store", async (orig) => ({
  ...(await orig<typeof import("@/lib/batches/intake/file-store")>()),
  openStoredFile: async (key: string) => (await import("./helpers/pipeline")).openMemoryFile(key),
}));

const { GET: dictionaryHandler } = await import("@/app/api/v1/pool/[slug]/dictionary/route");
const { GET: poolHandler } = await import("@/app/api/v1/pool/[slug]/route");
const { GET: poolRowsHandler } = await import("@/app/api/v1/pool/[slug]/rows/route");

const db = getDb();
const SLUG = `pool-export-${process.pid}`;
let studyIdOf = 0;

async function get(
  handler: (req: Request, ctx: { params: Promise<{ slug: string }> }) => Promise<Response>,
  path: string,
  email?: string,
) {
  const headers = new Headers();
  if (email) headers.set("cookie", await cookieOf(email));
  return handler(new Request(`http://127.0.0.1:3410${path}`, { headers }), {
    params: Promise.resolve({ slug: SLUG }),
  });
}

beforeAll(async () => {
  const s = await scratchStudy(SLUG, {
    title: `Export test ${SLUG}`,
    providers: ["harrowgate", "fennick-hill"],
  });
  studyIdOf = s.id;

  const analyst = await userId("analyst@lowmoor.test");
  const demo = barleyBatches();
  // a note that a spreadsheet would run as a formula
  const harrow = demo[0]!.csv.replace(/^(HG-\d+,[^,]*,),/m, "$1=2+3*cmd,");
  const a = await uploadAndCheck("provider@harrowgate.test", SLUG, harrow, { name: "harrowgate.csv" });
  const b = await uploadAndCheck("provider@fennick.test", SLUG, demo[4]!.csv, { name: "saltmarsh.csv" });
  const c = await uploadAndCheck("provider@fennick.test", SLUG, demo[5]!.csv, { name: "coldwell.csv" });
  expect((await decideVersion(analyst, a.batchPublicId, 1, { decision: "accept" })).ok).toBe(true);
  expect((await decideVersion(analyst, b.batchPublicId, 1, { decision: "accept" })).ok).toBe(true);
  expect(
    (await decideVersion(analyst, c.batchPublicId, 1, { decision: "bounce", comment: "Plot ids repeat." }))
      .ok,
  ).toBe(true);
});

afterAll(async () => {
  await releaseScratchStudy(SLUG);
  await getPool().end();
});

describe("pool export", () => {
  it("streams every accepted row with provenance; re-read, it has the pool's row count", async () => {
    const res = await get(poolRowsHandler, `/api/v1/pool/${SLUG}/rows`, "lead@lowmoor.test");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("text/csv");
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename=".*\.csv"/);
    const text = await res.text();
    const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    // harrowgate 180 + saltmarsh 140 (lib/demo/batches.ts); the bounced coldwell batch is not in it
    expect(parsed.data).toHaveLength(180 + 140);
    const pool = await (await get(poolHandler, `/api/v1/pool/${SLUG}`, "lead@lowmoor.test")).json();
    expect(parsed.data).toHaveLength(pool.data.report.rows.total);
    expect(parsed.meta.fields?.slice(0, 5)).toEqual([
      "organisation",
      "batch",
      "batch_title",
      "version",
      "source_row",
    ]);
    expect(new Set(parsed.data.map((r) => r.organisation))).toEqual(
      new Set(["Harrowgate Farm", "Fennick Hill Farm"]),
    );
    expect(parsed.data[0]!.source_row).toBe("2");
    // the semicolon file's decimal commas come out as points, so the column reads as numbers throughout
    const salt = parsed.data.filter((r) => r.organisation === "Fennick Hill Farm");
    expect(salt).toHaveLength(140);
    expect(salt.every((r) => /^-?\d+(\.\d+)?$/.test(r.yield_t_ha!))).toBe(true);
    // the formula-looking note is written as text (OWASP CSV injection guidance)
    expect(parsed.data.some((r) => r.farm_plot_note === "'=2+3*cmd")).toBe(true);
    expect(text).not.toMatch(/(^|,)=2\+3/m);
    const audit = await db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.studyId, studyIdOf), eq(auditEvents.action, "pool.export_rows")));
    expect(audit).toHaveLength(1);
  });

  it("writes the data dictionary with roles, levels and baseline, ranges, missing tokens and the pool's figures", async () => {
    const res = await get(dictionaryHandler, `/api/v1/pool/${SLUG}/dictionary`, "analyst@lowmoor.test");
    expect(res.status).toBe(200);
    const d = (await res.json()).data;
    const soil = d.columns.find((c: { name: string }) => c.name === "soil");
    expect(soil).toMatchObject({
      role: "predictor",
      type: "category",
      levels: ["loam", "clay", "sand", "silt"],
      baseline: "loam",
    });
    expect(d.columns.find((c: { name: string }) => c.name === "yield_t_ha")).toMatchObject({
      role: "response",
      min: 0,
      max: 14,
      missingTokens: ["", "NA"],
    });
    expect(d.pool.rows).toBe(320);
    expect(d.pool.headroom).toBe(d.pool.residualDf - 150);
    const csv = await (
      await get(dictionaryHandler, `/api/v1/pool/${SLUG}/dictionary?format=csv`, "analyst@lowmoor.test")
    ).text();
    expect(csv.split("\r\n")[0]).toMatch(/^column,role,type,/);
    expect(csv).toContain("df_headroom");
    const bad = await get(
      dictionaryHandler,
      `/api/v1/pool/${SLUG}/dictionary?format=xlsx`,
      "analyst@lowmoor.test",
    );
    expect(bad.status).toBe(422);
    const audit = await db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.studyId, studyIdOf), eq(auditEvents.action, "pool.export_dictionary")));
    expect(audit).toHaveLength(2);
  });

  it("refuses anonymous callers (401), providers (403) and analysts of other studies (404)", async () => {
    expect((await get(poolRowsHandler, `/api/v1/pool/${SLUG}/rows`)).status).toBe(401);
    expect((await get(poolRowsHandler, `/api/v1/pool/${SLUG}/rows`, "provider@harrowgate.test")).status).toBe(
      403,
    );
    const other = await get(poolRowsHandler, `/api/v1/pool/${SLUG}/rows`, "analyst2@lowmoor.test");
    expect(other.status).toBe(404);
    expect((await other.json()).code).toBe("not_found");
    expect((await get(poolHandler, `/api/v1/pool/${SLUG}`, "analyst2@lowmoor.test")).status).toBe(404);
  });
});
