/**
 * One timed run of a command for the benchmark: wall time measured here, CPU (user + system of
 * the child and every process it waited for) and peak resident set size from GNU time
 * (`/usr/bin/time -o FILE -f …`, which reads getrusage of its child). Without GNU time only
 * the wall time is known and CPU and memory are reported as unavailable.
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";

export interface Run {
  wallS: number;
  /** user + system CPU seconds (all threads and waited-for children); NaN without GNU time */
  cpuS: number;
  /** peak resident set size of the largest process, MB; NaN without GNU time */
  peakMB: number;
  status: number | null;
  stdout: string;
  stderr: string;
}

export const GNU_TIME = "/usr/bin/time";
export const hasGnuTime = () =>
  existsSync(GNU_TIME) && spawnSync(GNU_TIME, ["-f", "%M", "true"]).status === 0;

export function timedRun(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env): Run {
  const useTime = hasGnuTime();
  const dir = mkdtempSync(path.join(os.tmpdir(), "tributary-bench-"));
  const out = path.join(dir, "rusage");
  const argv = useTime ? [GNU_TIME, "-o", out, "-f", "%e %U %S %M", cmd, ...args] : [cmd, ...args];
  const t0 = performance.now();
  const res = spawnSync(argv[0]!, argv.slice(1), { encoding: "utf8", maxBuffer: 1 << 30, env });
  const wallS = (performance.now() - t0) / 1000;
  let cpuS = NaN;
  let peakMB = NaN;
  if (useTime && existsSync(out)) {
    // the last line (GNU time writes "Command exited with non-zero status N" before it)
    const last = readFileSync(out, "utf8").trim().split("\n").pop() ?? "";
    const [, user, sys, kb] = last.split(" ").map(Number);
    cpuS = (user ?? NaN) + (sys ?? NaN);
    peakMB = (kb ?? NaN) / 1024;
  }
  rmSync(dir, { recursive: true, force: true });
  return { wallS, cpuS, peakMB, status: res.status, stdout: res.stdout ?? "", stderr: res.stderr ?? "" };
}

export const median = (xs: number[]) => {
  const s = xs.filter((x) => !Number.isNaN(x)).sort((a, b) => a - b);
  if (s.length === 0) return NaN;
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};
