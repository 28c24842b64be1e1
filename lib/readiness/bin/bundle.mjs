// The engine's bundle: lib/readiness bundled by esbuild (tsx's own dependency) into .build/ beside
// this folder, rebuilt whenever a source under lib/readiness/ or the installed packages are newer.
// The command (./tributary-check.mjs) starts from it, and so do the worker threads of the
// server's checks (../node-stream.ts), which otherwise load the sources through tsx (about 0.4 s
// a thread).
import { mkdirSync, readdirSync, renameSync, rmSync, statSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

const ENGINE = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "..");
export const BUNDLE = path.join(ENGINE, ".build", "tributary-check.cjs");
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

export function bundleIsFresh() {
  try {
    return statSync(BUNDLE).mtimeMs >= newestSource();
  } catch {
    return false;
  }
}

/** Bundle the engine; true when a fresh bundle is in place. Concurrent runs each write their own file and rename it. */
export async function buildBundle() {
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

/** True when a fresh bundle is in place, building it when needed (false: it cannot be built here). */
export async function ensureBundle() {
  return bundleIsFresh() || (await buildBundle());
}
