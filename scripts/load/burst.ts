/** Runs scripts/load/upload-burst.ts as a child process: ready once the bodies are built, go sends them all. */
import { spawn } from "node:child_process";
import path from "node:path";
import { createInterface } from "node:readline";
import type { BurstResult } from "./upload-burst";

export interface Burst {
  /** resolves with one CSV file's size when every body is built */
  ready: Promise<number>;
  /** sends every upload at once; resolves with the outcome */
  go(): Promise<BurstResult>;
  kill(): void;
}

export function prepareBurst(
  root: string,
  accountsFile: string,
  origin: string,
  rows: number,
  timeoutS: number,
): Burst {
  const child = spawn(
    path.join(root, "node_modules", ".bin", "tsx"),
    ["scripts/load/upload-burst.ts", accountsFile, origin, String(rows), String(timeoutS)],
    {
      cwd: root,
      stdio: ["pipe", "pipe", "inherit"],
    },
  );
  const messages: ((line: string) => void)[] = [];
  const failures: ((e: Error) => void)[] = [];
  createInterface({ input: child.stdout }).on("line", (line) => messages.shift()?.(line));
  child.once("exit", (code) => {
    for (const fail of failures.splice(0))
      fail(new Error(`the upload sender stopped (exit ${code}) before it answered`));
  });
  const next = () =>
    new Promise<string>((resolve, reject) => {
      messages.push(resolve);
      failures.push(reject);
    });
  const ready = next().then((line) => (JSON.parse(line) as { csvBytes: number }).csvBytes);
  return {
    ready,
    async go() {
      const answer = next();
      child.stdin.write("go\n");
      return JSON.parse(await answer) as BurstResult;
    },
    kill: () => {
      if (child.exitCode === null) child.kill("SIGTERM");
    },
  };
}
