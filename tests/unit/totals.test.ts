/**
 * scripts/totals.ts against reports written by the real vitest and Playwright (fixture suites
 * with a pass, a failure, a skip and a file that cannot load), so a format change cannot make
 * failures disappear from the closing line.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, test, vi } from "vitest";
import { closingLine, tallyLine, tallyPlaywright, tallyVitest } from "@/scripts/totals";
import { PROCESS_PATIENCE_MS, processTestTimeout } from "../helpers/processes";

// two tests run the real vitest or Playwright: on a busy machine they are slow, not wrong
vi.setConfig({ testTimeout: processTestTimeout() });

const ROOT = path.resolve(import.meta.dirname, "../..");
// inside the repo so the fixtures resolve "vitest" and "@playwright/test" from node_modules
const DIR = path.join(ROOT, ".data/tmp", `totals-${process.pid}`);

beforeAll(() => {
  fs.mkdirSync(path.join(DIR, "v"), { recursive: true });
  fs.mkdirSync(path.join(DIR, "p"), { recursive: true });
  fs.writeFileSync(
    path.join(DIR, "v/vitest.config.mjs"),
    "export default { test: { include: ['*.test.mjs'] } };\n",
  );
  fs.writeFileSync(
    path.join(DIR, "v/a.test.mjs"),
    "import { test, expect } from 'vitest';\n" +
      "test('passes', () => expect(1 + 1).toBe(2));\n" +
      "test('fails', () => expect(1 + 1).toBe(3));\n" +
      "test.skip('skipped', () => {});\n",
  );
  fs.writeFileSync(path.join(DIR, "v/crash.test.mjs"), "import './does-not-exist.mjs';\n");
  fs.writeFileSync(
    path.join(DIR, "p/playwright.config.mjs"),
    "export default { testDir: '.', testMatch: '*.spec.mjs', workers: 1 };\n",
  );
  fs.writeFileSync(
    path.join(DIR, "p/a.spec.mjs"),
    "import { test, expect } from '@playwright/test';\n" +
      "test('passes', () => expect(2).toBe(2));\n" +
      "test('fails', () => expect(2).toBe(3));\n" +
      "test.skip('skipped', () => {});\n",
  );
});

afterAll(() => fs.rmSync(DIR, { recursive: true, force: true }));

describe("totals of real reports", () => {
  test("vitest: a file that cannot load counts as a failure beside the failing test", () => {
    const out = path.join(DIR, "vitest.json");
    const r = spawnSync(
      path.join(ROOT, "node_modules/.bin/vitest"),
      ["run", "--root", path.join(DIR, "v"), "--reporter=json", `--outputFile.json=${out}`],
      {
        encoding: "utf8",
        timeout: PROCESS_PATIENCE_MS,
      },
    );
    expect(r.status).not.toBe(0);
    const t = tallyVitest("v", r.status ?? 1, out);
    expect([t.passed, t.failed, t.skipped]).toEqual([1, 2, 1]);
    expect(t.problems.join("\n")).toContain("crash.test.mjs failed to run");
  });

  test("playwright: expected, unexpected and skipped", () => {
    const out = path.join(DIR, "playwright.json");
    const r = spawnSync(
      path.join(ROOT, "node_modules/.bin/playwright"),
      ["test", "--config", path.join(DIR, "p/playwright.config.mjs"), "--reporter=json"],
      {
        encoding: "utf8",
        timeout: PROCESS_PATIENCE_MS,
        env: { ...process.env, PLAYWRIGHT_JSON_OUTPUT_NAME: out, CI: "" },
      },
    );
    expect(r.status).toBe(1);
    const t = tallyPlaywright("p", r.status ?? 1, out);
    expect([t.passed, t.failed, t.skipped]).toEqual([1, 1, 1]);
  });
});

describe("crashed and missing suites are never dropped", () => {
  test("no report file is one failure", () => {
    expect(tallyVitest("v", 137, path.join(DIR, "absent.json"))).toMatchObject({ passed: 0, failed: 1 });
    expect(tallyPlaywright("p", 1, path.join(DIR, "absent.json"))).toMatchObject({ passed: 0, failed: 1 });
  });

  test("a non-zero exit with all tests passing is one failure", () => {
    const f = path.join(DIR, "ok.json");
    fs.writeFileSync(
      f,
      JSON.stringify({
        numPassedTests: 5,
        numFailedTests: 0,
        numPendingTests: 0,
        numTodoTests: 0,
        testResults: [],
      }),
    );
    expect(tallyVitest("v", 1, f)).toMatchObject({ passed: 5, failed: 1 });
    expect(tallyVitest("v", 0, f)).toMatchObject({ passed: 5, failed: 0 });
  });

  test("a Playwright global error (e.g. the web server did not start) is a failure", () => {
    const f = path.join(DIR, "pw-error.json");
    fs.writeFileSync(
      f,
      JSON.stringify({
        stats: { expected: 0, unexpected: 0, flaky: 0, skipped: 0 },
        errors: [{ message: "Timed out waiting 300000ms from config.webServer." }],
      }),
    );
    const t = tallyPlaywright("p", 1, f);
    expect(t.failed).toBe(1);
    expect(t.problems[0]).toContain("webServer");
  });

  test("steps and suites that did not run", () => {
    expect(tallyLine("step", "next build", 0, "")).toMatchObject({ failed: 0 });
    expect(tallyLine("step", "next build", 1, "")).toMatchObject({ failed: 1 });
    expect(tallyLine("not-run", "playwright", 0, "")).toMatchObject({ failed: 1 });
  });

  test("the closing line", () => {
    expect(closingLine({ passed: 12, failed: 0, skipped: 0 })).toBe("12 passed, 0 failed");
    expect(closingLine({ passed: 12, failed: 3, skipped: 2 })).toBe("12 passed, 3 failed, 2 skipped");
  });
});
