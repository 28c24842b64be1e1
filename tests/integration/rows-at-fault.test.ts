/**
 * Rows at fault: the provider's download of the original rows that carry findings, with the
 * codes and messages beside them; formula cells neutralised as OWASP's CSV-injection guidance
 * says (a leading = + - @ is prefixed with a quote); scoped like the report.
 */
import { afterAll, describe, expect, it } from "vitest";
import Papa from "papaparse";
import { and, eq } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { batchVersions, dataPlans, reports } from "@/db/schema";
import { barleyBatches } from "@/lib/demo/batches";
import { rowsAtFaultCsv } from "@/lib/batches/intake/rows-at-fault";
import type { ReadinessReport } from "@/lib/readiness";
import { GET } from "@/app/api/v1/batches/[id]/versions/[version]/rows-at-fault/route";
import { openMemoryFile, uploadAndCheck } from "./helpers/pipeline";
import { sessionCookieFor } from "./helpers/session";
import { seededUser } from "./helpers/seeded";

afterAll(async () => {
  await getPool().end();
});

async function text(stream: ReadableStream<Uint8Array>): Promise<string> {
  return new Response(stream).text();
}

describe("rows at fault", () => {
  it("lists the faulty rows with their codes, keeps the file's columns, and neutralises formula cells", async () => {
    // the Fennick file with a formula planted in a free-text cell of a row that has a level variant
    const lines = barleyBatches()[1]!.csv.trimEnd().split("\n");
    const header = lines[0]!.split(",");
    const noteAt = header.indexOf("farm_plot_note");
    const target = lines.findIndex((l, i) => i > 0 && l.includes(",Clay,"));
    const cells = lines[target]!.split(",");
    cells[noteAt] = '=HYPERLINK("http://example.invalid")';
    lines[target] = cells
      .map((c) => (c.includes(",") || c.includes('"') ? `"${c.replace(/"/g, '""')}"` : c))
      .join(",");
    const up = await uploadAndCheck("provider@fennick.test", "barley-nitrogen", lines.join("\n") + "\n");
    const db = getDb();
    const [v] = await db
      .select({ fileKey: batchVersions.fileKey, planId: batchVersions.planId })
      .from(batchVersions)
      .where(eq(batchVersions.id, up.batchVersionId));
    const [plan] = await db
      .select({ plan: dataPlans.plan })
      .from(dataPlans)
      .where(eq(dataPlans.id, v!.planId));
    const [stored] = await db
      .select({ report: reports.report })
      .from(reports)
      .where(and(eq(reports.batchVersionId, up.batchVersionId)));
    const report = stored!.report as ReadinessReport;

    const csv = await text(
      rowsAtFaultCsv({ fileKey: v!.fileKey, plan: plan!.plan, report, openFile: openMemoryFile }),
    );
    const parsed = Papa.parse<string[]>(csv.trim(), { skipEmptyLines: true });
    const [head, ...rows] = parsed.data;
    expect(head).toEqual(["line", ...header, "finding_codes", "findings"]);
    // every sample row of the level.variant finding is listed with that code
    const variant = report.findings.find((f) => f.code === "level.variant")!;
    const byLine = new Map(rows.map((r) => [Number(r[0]), r]));
    for (const line of variant.rows) expect(byLine.get(line)?.at(-2)).toContain("level.variant");
    // the planted formula comes back as text, not as a formula
    const planted = byLine.get(target + 1)!;
    expect(planted[noteAt + 1]).toBe('\'=HYPERLINK("http://example.invalid")');
    expect(csv).not.toMatch(/(^|,)=HYPERLINK/m);
    // a row without findings is not listed
    expect(rows.length).toBeLessThan(lines.length - 1);
  });

  it("answers 404 to a provider of another organisation and to an analyst of another study", async () => {
    const up = await uploadAndCheck("provider@fennick.test", "barley-nitrogen", barleyBatches()[1]!.csv);
    for (const email of ["provider@harrowgate.test", "analyst2@lowmoor.test"]) {
      const u = await seededUser(email);
      const cookie = await sessionCookieFor(u);
      const res = await GET(
        new Request(`http://127.0.0.1:3410/api/v1/batches/${up.batchPublicId}/versions/1/rows-at-fault`, {
          headers: { cookie },
        }),
        {
          params: Promise.resolve({ id: up.batchPublicId, version: "1" }),
        },
      );
      expect(res.status).toBe(404);
    }
  });
});
