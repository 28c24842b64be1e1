#!/usr/bin/env node
// The command `tributary-check` (usage: tributary-check --help). The engine is TypeScript. The
// first run, and the first after any change to the engine's sources or the installed packages,
// bundles it once with esbuild (tsx's own dependency) into .build/ beside this folder; every later
// run loads that bundle and so starts without a TypeScript loader (about 0.8 s less per run). When
// bundling is not possible (a read-only checkout, esbuild missing), tsx's module hooks load the
// sources instead: slower to start, the same command. checkFile's worker threads start from this
// file too, and take the same bundle.
import { existsSync, mkdirSync, readdirSync, renameSync, rmSync, statSync } from "node:fs";
import { createRequire } from "node:module";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { isMainThread } from "node:worker_threads";

const ENGINE = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
const BUNDLE = path.join(ENGINE, ".build", "tributary-check.cjs");
const ENTRY = path.join(ENGINE, "cli", "entry.ts");

/** The newest modification time among the engine's sources and the lock file of what is installed. */
function newestSource(dir = ENGINE) {
  let newest = 0;
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    if (e.name === ".build" || e.name === "node_modules") continue;
    const p = path.join(dir, e.name);
    if (e.isDirectory()) newest = Math.max(newest, newestSource(p));
    else if (/\.(ts|json)$/.test(e.name)) newest = Math.max(newest, statSync(p).mtimeMs);
  }
  if (dir === ENGINE) {
    for (const lock of ["../../package-lock.json", "../../node_modules/.package-lock.json"]) {
      try {
        newest = Math.max(newest, statSync(path.join(ENGINE, lock)).mtimeMs);
      } catch {
        // no lock file: the sources alone decide
      }
    }
  }
  return newest;
}

function bundleIsFresh() {
  try {
    return statSync(BUNDLE).mtimeMs >= newestSource();
  } catch {
    return false;
  }
}

/** Bundle the engine; true when a fresh bundle is in place. Concurrent runs each write their own file and rename it. */
async function buildBundle() {
  const part = `${BUNDLE}.${process.pid}.${Date.now()}.part`;
  try {
    const { build } = await import("esbuild");
    mkdirSync(path.dirname(BUNDLE), { recursive: true });
    await build({
      entryPoints: [ENTRY],
      bundle: true,
      platform: "node",
      format: "cjs",
      target: "node20",
      outfile: part,
      logLevel: "silent",
    });
    renameSync(part, BUNDLE);
    return true;
  } catch {
    rmSync(part, { force: true });
    return false;
  }
}

// a check's worker thread takes what its main thread settled: the bundle, without walking the sources again
const useBundle =
  process.env.TRIBUTARY_CHECK_SOURCES !== "1" &&
  (isMainThread ? bundleIsFresh() || (await buildBundle()) : existsSync(BUNDLE));
if (useBundle) {
  createRequire(import.meta.url)(BUNDLE);
} else {
  process.env.TRIBUTARY_CHECK_SOURCES = "1"; // and so do the worker threads, which inherit it
  const { register } = await import("tsx/esm/api");
  register();
  await import("../cli/entry.ts");
}
