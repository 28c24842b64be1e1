/**
 * Waiting for processes a test starts (the worker, next, scripts, R): on a readiness signal — a
 * line it prints, its exit — never on a fixed sleep, and with a bound of minutes, so that a slow
 * or busy machine makes such a test slower, never red. The bound only catches a process that
 * hangs.
 */
import { spawn, type ChildProcess, type SpawnOptions } from "node:child_process";

/** How long a test waits for one process to signal readiness or to end. */
export const PROCESS_PATIENCE_MS = 5 * 60_000;

/** The test timeout of a test that waits on `waits` processes one after the other. */
export function processTestTimeout(waits = 1): number {
  return waits * PROCESS_PATIENCE_MS + 60_000;
}

export interface Started {
  child: ChildProcess;
  /** stdout and stderr so far, interleaved as they came */
  output: () => string;
  /** resolves with the first output line matching `re`; rejects when the process ends first or after `boundMs` */
  waitForLine: (re: RegExp, boundMs?: number) => Promise<string>;
  /** resolves when the process has ended (with its exit code, null when a signal ended it) */
  exited: Promise<number | null>;
  /** ends the process (SIGTERM, then SIGKILL after `graceMs`) and waits until it is gone */
  stop: (graceMs?: number) => Promise<void>;
}

/** Starts `command` with piped output and gives ways to wait on it. */
export function startProcess(command: string, args: string[], options: SpawnOptions = {}): Started {
  const child = spawn(command, args, { ...options, stdio: ["ignore", "pipe", "pipe"] });
  let text = "";
  let ended = false;
  const waiters: { re: RegExp; resolve: (line: string) => void; reject: (e: Error) => void }[] = [];
  const check = () => {
    const lines = text.split("\n");
    for (const w of [...waiters]) {
      const line = lines.find((l) => w.re.test(l));
      if (line !== undefined) {
        waiters.splice(waiters.indexOf(w), 1);
        w.resolve(line);
      }
    }
  };
  const onData = (d: Buffer) => {
    text += d.toString("utf8");
    check();
  };
  child.stdout!.on("data", onData);
  child.stderr!.on("data", onData);
  const exited = new Promise<number | null>((resolve) => {
    child.on("close", (code) => {
      ended = true;
      check();
      for (const w of waiters.splice(0)) {
        w.reject(
          new Error(
            `${command} ended (exit code ${code}) before printing a line matching ${w.re}; it printed:\n${text}`,
          ),
        );
      }
      resolve(code);
    });
  });
  return {
    child,
    output: () => text,
    exited,
    waitForLine(re, boundMs = PROCESS_PATIENCE_MS) {
      return new Promise((resolve, reject) => {
        const seen = text.split("\n").find((l) => re.test(l));
        if (seen !== undefined) return resolve(seen);
        if (ended)
          return reject(
            new Error(`${command} had ended without a line matching ${re}; it printed:\n${text}`),
          );
        const timer = setTimeout(() => {
          reject(
            new Error(
              `${command} printed no line matching ${re} within ${boundMs / 1000} s; it printed:\n${text}`,
            ),
          );
        }, boundMs);
        const done =
          <T>(f: (v: T) => void) =>
          (v: T) => (clearTimeout(timer), f(v));
        waiters.push({ re, resolve: done(resolve), reject: done(reject) });
      });
    },
    async stop(graceMs = 30_000) {
      if (ended) return;
      child.kill("SIGTERM");
      const timer = setTimeout(() => child.kill("SIGKILL"), graceMs);
      await exited;
      clearTimeout(timer);
    },
  };
}

/** Runs `command` to its end (bounded by PROCESS_PATIENCE_MS): exit code and output. */
export async function runProcess(
  command: string,
  args: string[],
  options: SpawnOptions = {},
  boundMs = PROCESS_PATIENCE_MS,
): Promise<{ code: number | null; output: string }> {
  const p = startProcess(command, args, options);
  const timer = setTimeout(() => p.child.kill("SIGKILL"), boundMs);
  const code = await p.exited;
  clearTimeout(timer);
  return { code, output: p.output() };
}
