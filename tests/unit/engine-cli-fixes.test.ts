/**
 * The command line's --apply-fixes (issue 12, point 5): the corrected file and its change log
 * beside it, all proposals or those named with --only; the original untouched; a bad name says
 * what the file's proposals are.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { beforeAll, describe, expect, test, vi } from "vitest";
import { HEADER, cleanRows, csvOf, planInput } from "../fixtures/engine/data";
import { PROCESS_PATIENCE_MS, processTestTimeout } from "../helpers/processes";

vi.setConfig({ testTimeout: processTestTimeout() });

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tributary-cli-fixes-"));
const f = (name: string) => path.join(dir, name);
const cli = (...args: string[]) => {
  const r = spawnSync(process.execPath, ["lib/readiness/bin/tributary-check.mjs", ...args], {
    encoding: "utf8",
    timeout: PROCESS_PATIENCE_MS,
  });
  return { code: r.status, out: r.stdout, err: r.stderr };
};
let original = "";

beforeAll(() => {
  fs.writeFileSync(f("plan.json"), JSON.stringify(planInput({ missingTokens: ["", "NA"] })));
  const rows = cleanRows(200);
  const soil = HEADER.indexOf("soil");
  rows.forEach((r, i) => {
    if (r[soil] === "clay" && i % 2) r[soil] = "Clay";
  });
  rows[4]![HEADER.indexOf("farm")] = "NA";
  original = csvOf(HEADER, rows, ",", "\r\n");
  fs.writeFileSync(f("batch.csv"), original);
});

describe("--apply-fixes", () => {
  test("all proposals: the corrected file and OUT.changes.csv; the original untouched", () => {
    const r = cli(f("batch.csv"), "--plan", f("plan.json"), "--apply-fixes", f("fixed.csv"));
    expect(r.code, r.err).toBe(1); // the original's level.unknown blocker
    expect(r.err).toMatch(/applied missing\.token:farm \(1 cell\), level\.variant:soil \(\d+ cells\)/);
    const fixed = fs.readFileSync(f("fixed.csv"), "utf8");
    expect(fixed).toBe(original.replace(/,Clay,/g, ",clay,").replace(",NA,", ",,"));
    const log = fs.readFileSync(f("fixed.changes.csv"), "utf8").split("\r\n");
    expect(log[0]).toBe("row,column,before,after,proposal");
    expect(log).toContain("6,farm,NA,,missing.token:farm");
    expect(log.filter((l) => l.endsWith(",level.variant:soil")).length).toBe(
      (original.match(/,Clay,/g) ?? []).length,
    );
    expect(fs.readFileSync(f("batch.csv"), "utf8")).toBe(original);
    const again = cli(f("fixed.csv"), "--plan", f("plan.json"));
    expect(again.code, again.out).toBe(0);
  });

  test("--only picks proposals by code; an unknown name lists the file's proposals", () => {
    const r = cli(
      f("batch.csv"),
      "--plan",
      f("plan.json"),
      "--apply-fixes",
      f("only.csv"),
      "--only",
      "missing.token",
    );
    expect(r.err).toMatch(/applied missing\.token:farm \(1 cell\)/);
    expect(fs.readFileSync(f("only.csv"), "utf8")).toBe(original.replace(",NA,", ",,"));
    const bad = cli(
      f("batch.csv"),
      "--plan",
      f("plan.json"),
      "--apply-fixes",
      f("bad.csv"),
      "--only",
      "level.typo",
    );
    expect(bad.code).toBe(2);
    expect(bad.err).toMatch(
      /--only names level\.typo, which is not a proposal of this file \(its proposals: missing\.token:farm, level\.variant:soil\)/,
    );
    const same = cli(f("batch.csv"), "--plan", f("plan.json"), "--apply-fixes", f("batch.csv"));
    expect(same.code).toBe(2);
    expect(same.err).toMatch(/another name/);
  });
});
