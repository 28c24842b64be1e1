/**
 * The report format's JSON Schema (lib/readiness/report.schema.json, generated from the types
 * of lib/readiness/report.ts by ts-json-schema-generator): the committed file is what the
 * generator makes of the types now, and every report stored in the database — the seeded
 * database's and those of demo batches checked here, with and without findings — validates
 * against it (ajv, draft-07).
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import Ajv from "ajv";
import { createGenerator } from "ts-json-schema-generator";
import { beforeAll, describe, expect, test } from "vitest";
import { getDb } from "@/db/client";
import { reports } from "@/db/schema";
import { barleyBatches } from "@/lib/demo/batches";
import { uploadAndCheck } from "./helpers/pipeline";

const ROOT = path.resolve(import.meta.dirname, "../..");
const SCHEMA_FILE = path.join(ROOT, "lib/readiness/report.schema.json");
const committed = JSON.parse(readFileSync(SCHEMA_FILE, "utf8")) as object;

beforeAll(async () => {
  const demo = barleyBatches();
  for (const b of demo.slice(0, 3)) await uploadAndCheck("provider@fennick.test", "barley-nitrogen", b.csv);
}, 600_000);

describe("the report's JSON Schema", () => {
  test("is current: generated again from lib/readiness/report.ts it is the committed file", () => {
    const fresh = createGenerator({
      path: path.join(ROOT, "lib/readiness/report.ts"),
      tsconfig: path.join(ROOT, "tsconfig.json"),
      type: "ReadinessReport",
      skipTypeCheck: true,
    }).createSchema("ReadinessReport");
    expect(fresh).toEqual(committed);
  }, 300_000);

  test("every stored report validates, and a broken one does not", async () => {
    const validate = new Ajv({ allErrors: true }).compile(committed);
    const rows = await getDb()
      .select({ id: reports.id, status: reports.status, report: reports.report })
      .from(reports);
    const checked = rows.filter((r) => r.status === "checked");
    expect(checked.length).toBeGreaterThanOrEqual(3);
    for (const r of checked)
      expect(validate(r.report), `report ${r.id}: ${JSON.stringify(validate.errors)}`).toBe(true);
    const withFindings = checked.find(
      (r) => ((r.report as { findings?: unknown[] }).findings ?? []).length > 0,
    );
    expect(withFindings, "at least one stored report has findings").toBeDefined();
    const broken = { ...(withFindings!.report as object), format: "one" };
    expect(validate(broken)).toBe(false);
  });
});
