/**
 * Run R scripts from tests (R is a reference implementation for cross-checks).
 * Scripts print one JSON document on stdout through tests/r/json.R (no R package needed).
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { PROCESS_PATIENCE_MS } from "./processes";

export const R_DIR = path.resolve(import.meta.dirname, "../r");

let cached: { ok: true; version: string } | { ok: false; reason: string } | undefined;

/** Whether Rscript (and, when asked, some packages) can be run here; the reason when not. */
export function rscriptAvailable(
  packages: string[] = [],
): { ok: true; version: string } | { ok: false; reason: string } {
  if (!cached) {
    const v = spawnSync("Rscript", ["--version"], { encoding: "utf8" });
    if (v.error || v.status !== 0)
      cached = { ok: false, reason: `Rscript not found on PATH (${v.error?.message ?? v.stderr})` };
    else cached = { ok: true, version: (v.stdout + v.stderr).trim() };
  }
  if (!cached.ok || packages.length === 0) return cached;
  const check = spawnSync(
    "Rscript",
    [
      "-e",
      `for (p in c(${packages.map((p) => JSON.stringify(p)).join(",")})) if (!requireNamespace(p, quietly = TRUE)) { cat(p); quit(status = 3) }`,
    ],
    { encoding: "utf8" },
  );
  if (check.status !== 0)
    return { ok: false, reason: `R package ${check.stdout.trim() || packages.join(", ")} is not installed` };
  return cached;
}

/** Run tests/r/<script> with arguments; returns stdout, throws with R's stderr on failure. */
export function runRscript(script: string, args: string[] = [], timeoutMs = PROCESS_PATIENCE_MS): string {
  const file = path.isAbsolute(script) ? script : path.join(R_DIR, script);
  const res = spawnSync("Rscript", ["--vanilla", file, ...args], {
    encoding: "utf8",
    timeout: timeoutMs,
    maxBuffer: 64 * 1024 * 1024,
  });
  if (res.error) throw new Error(`Rscript ${path.basename(file)} could not run: ${res.error.message}`);
  if (res.status !== 0)
    throw new Error(`Rscript ${path.basename(file)} failed (exit ${res.status}):\n${res.stderr}`);
  return res.stdout;
}

/** Run an R script that prints JSON (via json.R's to_json) and parse it. */
export function runRJson<T = unknown>(script: string, args: string[] = [], timeoutMs?: number): T {
  const out = runRscript(script, args, timeoutMs);
  const start = out.indexOf("{");
  const startArr = out.indexOf("[");
  const s = start < 0 ? startArr : startArr < 0 ? start : Math.min(start, startArr);
  if (s < 0) throw new Error(`R script ${script} printed no JSON:\n${out.slice(0, 2000)}`);
  return JSON.parse(out.slice(s)) as T;
}

/** A fresh temporary directory for CSV files handed to R. */
export function tempDir(prefix = "tributary-r-"): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), prefix));
}

/** Write rows as CSV with full double precision (%.17g round-trips in R's read.csv). */
export function writeCsv(file: string, header: string[], rows: (number | string | null)[][]): void {
  const fmt = (v: number | string | null) =>
    v === null ? "NA" : typeof v === "number" ? v.toPrecision(17) : v;
  fs.writeFileSync(file, [header.join(","), ...rows.map((r) => r.map(fmt).join(","))].join("\n") + "\n");
}
