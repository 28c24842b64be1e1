/**
 * The private stack of a load run: scripts/load-server.sh in its own process group, started
 * here and stopped here (SIGTERM, then SIGKILL of that group only), never anything else.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { createWriteStream, mkdirSync } from "node:fs";
import path from "node:path";

export interface Stack {
  origin: string;
  accountsFile: string;
  /** false once the server script has exited (a part of the stack stopped) */
  alive(): boolean;
  /** stops the stack (idempotent); resolves when the server script has exited */
  stop(): Promise<void>;
}

/** Starts the stack and resolves once it prints "ready" (rejects when it exits first or `limitMs` passes). */
export function startStack(
  root: string,
  setupArgs: string[],
  limitMs: number,
  log: (line: string) => void,
): Promise<Stack> {
  const dir = path.join(root, ".data", "load");
  mkdirSync(dir, { recursive: true });
  const out = createWriteStream(path.join(dir, "server.log"));
  const child: ChildProcess = spawn("bash", ["scripts/load-server.sh", ...setupArgs], {
    cwd: root,
    detached: true,
    stdio: ["ignore", "pipe", "pipe"],
    env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
  });
  let exited = false;
  const exitedP = new Promise<void>((resolve) => child.once("exit", () => ((exited = true), resolve())));

  const stop = async () => {
    if (exited || child.pid === undefined) return;
    child.kill("SIGTERM");
    const t = setTimeout(() => {
      if (!exited && child.pid !== undefined) process.kill(-child.pid, "SIGKILL");
    }, 60_000);
    await exitedP;
    clearTimeout(t);
  };

  return new Promise<Stack>((resolve, reject) => {
    let buffer = "";
    const onLine = (line: string) => {
      out.write(line + "\n");
      log(line);
      const m = /^\[load-server\] ready (\S+) accounts=(\S+)/.exec(line);
      if (m?.[1] && m[2]) {
        clearTimeout(timer);
        resolve({ origin: m[1], accountsFile: m[2], alive: () => !exited, stop });
      }
    };
    const feed = (chunk: Buffer) => {
      buffer += chunk.toString("utf8");
      let i: number;
      while ((i = buffer.indexOf("\n")) >= 0) {
        onLine(buffer.slice(0, i));
        buffer = buffer.slice(i + 1);
      }
    };
    child.stdout?.on("data", feed);
    child.stderr?.on("data", feed);
    const timer = setTimeout(() => {
      void stop().then(() =>
        reject(
          new Error(
            `the load stack was not ready within ${Math.round(limitMs / 1000)} s (log: .data/load/server.log)`,
          ),
        ),
      );
    }, limitMs);
    void exitedP.then(() => {
      clearTimeout(timer);
      reject(
        new Error(
          `the load stack stopped during start-up (exit ${child.exitCode ?? child.signalCode}); see .data/load/server.log`,
        ),
      );
    });
  });
}
