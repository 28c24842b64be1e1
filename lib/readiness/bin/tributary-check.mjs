#!/usr/bin/env node
// The command `tributary-check` (usage: tributary-check --help). The engine is TypeScript. The
// first run, and the first after any change to the engine's sources or the installed packages,
// bundles it once with esbuild (./bundle.mjs) into .build/ beside this folder; every later
// run loads that bundle and so starts without a TypeScript loader (about 0.8 s less per run). When
// bundling is not possible (a read-only checkout, esbuild missing), tsx's module hooks load the
// sources instead: slower to start, the same command. checkFile's worker threads start from this
// file too, and take the same bundle.
import { createRequire } from "node:module";
import { existsSync } from "node:fs";
import { isMainThread } from "node:worker_threads";
import { BUNDLE, ensureBundle } from "./bundle.mjs";

// a check's worker thread takes what its main thread settled: the bundle, without walking the sources again
const useBundle =
  process.env.TRIBUTARY_CHECK_SOURCES !== "1" && (isMainThread ? await ensureBundle() : existsSync(BUNDLE));
if (useBundle) {
  createRequire(import.meta.url)(BUNDLE);
} else {
  process.env.TRIBUTARY_CHECK_SOURCES = "1"; // and so do the worker threads, which inherit it
  const { register } = await import("tsx/esm/api");
  register();
  await import("../cli/entry.ts");
}
