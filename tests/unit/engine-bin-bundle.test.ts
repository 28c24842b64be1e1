/**
 * `tributary-check` starts from a bundle of the engine (lib/readiness/bin/tributary-check.mjs):
 * built on the first run and again whenever a source is newer, and giving exactly the report the
 * TypeScript sources give under tsx (TRIBUTARY_CHECK_SOURCES=1): exactly on one thread, and on
 * two threads (a file past PARALLEL_MIN_BYTES) to 1e-9 relative, as the parallel tests compare.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { beforeAll, expect, test } from "vitest";
import { PARALLEL_MIN_BYTES } from "@/lib/readiness/node";
import { HEADER, cleanRows, csvOf, planInput } from "../fixtures/engine/data";
import { close } from "../helpers/close";
import { PROCESS_PATIENCE_MS, processTestTimeout } from "../helpers/processes";

const ENGINE = path.resolve("lib/readiness");
const BIN = path.join(ENGINE, "bin/tributary-check.mjs");
const BUNDLE = path.join(ENGINE, ".build/tributary-check.cjs");
const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tributary-bin-"));

function run(env: Record<string, string>, ...args: string[]) {
  const r = spawnSync(process.execPath, [BIN, ...args], {
    encoding: "utf8",
    timeout: PROCESS_PATIENCE_MS,
    env: { ...process.env, ...env },
  });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

function newestSource(d: string): number {
  let newest = 0;
  for (const e of fs.readdirSync(d, { withFileTypes: true })) {
    if (e.name === ".build") continue;
    const p = path.join(d, e.name);
    newest = Math.max(newest, e.isDirectory() ? newestSource(p) : fs.statSync(p).mtimeMs);
  }
  return newest;
}

beforeAll(() => {
  fs.writeFileSync(path.join(dir, "plan.json"), JSON.stringify(planInput()));
  // past PARALLEL_MIN_BYTES, so that --workers 2 really reads the file on two threads
  const rows = cleanRows(Math.ceil((PARALLEL_MIN_BYTES * 1.2) / 60));
  rows[3]![HEADER.indexOf("soil")] = "peat";
  rows[40]![HEADER.indexOf("yield")] = "n/a";
  fs.writeFileSync(path.join(dir, "batch.csv"), csvOf(HEADER, rows));
});

test(
  "a stale bundle is rebuilt before the run, and then is newer than every source",
  () => {
    const r0 = run({}, "--version");
    expect(r0.code, r0.err).toBe(0);
    expect(fs.existsSync(BUNDLE)).toBe(true);
    fs.utimesSync(BUNDLE, new Date(0), new Date(0));
    const r = run({}, "--version");
    expect(r.code, r.err).toBe(0);
    expect(r.out.trim()).toBe(r0.out.trim());
    expect(fs.statSync(BUNDLE).mtimeMs).toBeGreaterThanOrEqual(newestSource(ENGINE));
  },
  processTestTimeout(2),
);

test(
  "the bundle and the sources give the same report, on one thread and on two",
  () => {
    const file = path.join(dir, "batch.csv");
    expect(fs.statSync(file).size).toBeGreaterThan(PARALLEL_MIN_BYTES);
    const args = [file, "--plan", path.join(dir, "plan.json"), "--json"];
    const strip = (json: string) => {
      const rep = JSON.parse(json);
      delete rep.timings; // the run's own duration
      return rep;
    };
    const fromSources = run({ TRIBUTARY_CHECK_SOURCES: "1" }, ...args, "--workers", "1");
    expect(fromSources.code, fromSources.err).toBe(1);
    const expected = strip(fromSources.out);
    expect(expected.counts.blocker).toBeGreaterThan(0);
    // one thread: exactly the sources' report
    const one = run({}, ...args, "--workers", "1");
    expect(one.code, one.err).toBe(1);
    expect(strip(one.out)).toEqual(expected);
    // two threads: the same up to floating-point merge order, as the parallel tests compare
    const two = run({}, ...args, "--workers", "2");
    expect(two.code, two.err).toBe(1);
    // (the merge state is left out: a merged least-squares factor holds the same fit in other numbers)
    const { state: _a, ...figures } = expected;
    const { state: _b, ...twoFigures } = strip(two.out);
    close(figures, twoFigures, "report");
  },
  processTestTimeout(3),
);
