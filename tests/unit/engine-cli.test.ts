/**
 * The command line (issue 3, point 8): exit 0 without blockers, 1 with blockers, 2 for an
 * unreadable file or bad usage; --json prints the report alone; --draft-plan a plan.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, test, vi } from "vitest";
import { parsePlan } from "@/lib/readiness";
import { HEADER, cleanRows, csvOf, planInput } from "../fixtures/engine/data";
import { PROCESS_PATIENCE_MS, processTestTimeout } from "../helpers/processes";

// each test runs the command line once: on a busy machine it is slow, not wrong
vi.setConfig({ testTimeout: processTestTimeout() });

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tributary-cli-"));
const f = (name: string) => path.join(dir, name);

function cli(...args: string[]) {
  const r = spawnSync(process.execPath, ["--import", "tsx", "scripts/check.ts", ...args], { encoding: "utf8", timeout: PROCESS_PATIENCE_MS });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

beforeAll(() => {
  fs.writeFileSync(f("plan.json"), JSON.stringify(planInput()));
  fs.writeFileSync(f("bad-plan.json"), JSON.stringify({ columns: [{ name: "a", role: "response", type: "number" }, { name: "b", role: "response", type: "category", levels: ["x"], baseline: "y" }] }));
  fs.writeFileSync(f("clean.csv"), csvOf(HEADER, cleanRows(200)));
  const bad = cleanRows(200);
  bad[3]![HEADER.indexOf("soil")] = "peat";
  fs.writeFileSync(f("blocker.csv"), csvOf(HEADER, bad));
  fs.writeFileSync(f("book.csv"), Buffer.from([0x50, 0x4b, 0x03, 0x04, 0, 0, 0, 0, 0, 0]));
});

describe("exit codes", () => {
  test.each([
    { name: "clean file → 0", args: () => [f("clean.csv"), "--plan", f("plan.json")], code: 0, out: /0 blockers/ },
    { name: "a blocker → 1", args: () => [f("blocker.csv"), "--plan", f("plan.json")], code: 1, out: /\[BLOCKER\] level\.unknown \(soil\)[\s\S]*rows: 5/ },
    { name: "unreadable file → 2", args: () => [f("book.csv"), "--plan", f("plan.json")], code: 2, out: /Excel workbook/ },
    { name: "missing file → 2", args: () => [f("nope.csv"), "--plan", f("plan.json")], code: 2, err: /no such file/ },
    { name: "no plan → 2", args: () => [f("clean.csv")], code: 2, err: /--plan PLAN\.json is required/ },
    { name: "unknown option → 2", args: () => [f("clean.csv"), "--frobnicate"], code: 2, err: /unknown option/ },
    { name: "invalid plan → 2 with field messages", args: () => [f("clean.csv"), "--plan", f("bad-plan.json")], code: 2, err: /columns\.1\.baseline: baseline "y" is not among the levels[\s\S]*exactly one response/ },
  ])("$name", ({ args, code, out, err }) => {
    const r = cli(...args());
    expect(r.code, r.err).toBe(code);
    if (out) expect(r.out).toMatch(out);
    if (err) expect(r.err).toMatch(err);
  });
});

describe("output modes", () => {
  test("--json prints the report JSON alone", () => {
    const r = cli(f("blocker.csv"), "--plan", f("plan.json"), "--json");
    expect(r.code).toBe(1);
    const rep = JSON.parse(r.out);
    expect(rep.status).toBe("checked");
    expect(rep.rows).toEqual({ total: 200, complete: 199 });
    expect(rep.findings[0].code).toBe("level.unknown");
  });

  test("--draft-plan proposes levels by frequency, the most frequent as baseline, and a valid plan once the response is named", () => {
    const r = cli(f("clean.csv"), "--draft-plan", "--response", "yield");
    expect(r.code).toBe(0);
    const draft = JSON.parse(r.out);
    const soil = draft.columns.find((c: { name: string }) => c.name === "soil");
    expect(soil).toMatchObject({ role: "predictor", type: "category", baseline: soil.levels[0] });
    expect(soil.levels.sort()).toEqual(["clay", "loam", "sand", "silt"]);
    expect(draft.columns.find((c: { name: string }) => c.name === "plot_id")).toMatchObject({ role: "key", type: "integer" });
    expect(draft.columns.find((c: { name: string }) => c.name === "sow_date")).toMatchObject({ type: "date" });
    const nitrogen = draft.columns.find((c: { name: string }) => c.name === "nitrogen");
    const values = cleanRows(200).map((x) => Number(x[HEADER.indexOf("nitrogen")]));
    expect(nitrogen).toMatchObject({ type: "number", min: Math.min(...values), max: Math.max(...values) });
    expect(parsePlan(draft).ok).toBe(true);
  });
});
