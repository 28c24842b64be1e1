/**
 * The processes of a scale topology (scripts/load/scale-stack.ts, and the short version in
 * tests/integration/scale-topology.test.ts): each part in its own process group, its output in
 * a log file of its own, ready when its port answers or when it prints a given line — never after
 * a fixed pause. Parts are stopped by their own group id only, never by name.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { createWriteStream, mkdirSync, readFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";

export interface PartSpec {
  name: string;
  command: string;
  args: string[];
  env: NodeJS.ProcessEnv;
  cwd: string;
  /** ready when this loopback port accepts connections … */
  port?: number;
  /** … or when the part prints a line matching this */
  readyLine?: RegExp;
}

export interface Part {
  spec: PartSpec;
  pid: number;
  logFile: string;
  alive(): boolean;
  exited: Promise<number | null>;
}

/** True when something accepts TCP connections on 127.0.0.1:port. */
export function portOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect({ host: "127.0.0.1", port });
    s.once("connect", () => (s.destroy(), resolve(true)));
    s.once("error", () => resolve(false));
  });
}

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Polls `test` every 200 ms until it holds; throws with `what` after `boundMs` (a hang, not a slow start). */
export async function until(what: string, test: () => Promise<boolean> | boolean, boundMs: number) {
  const end = Date.now() + boundMs;
  // a test that throws (a server restarting) counts as not yet
  const holds = async () => {
    try {
      return await test();
    } catch {
      return false;
    }
  };
  while (!(await holds())) {
    if (Date.now() > end) throw new Error(`${what} did not happen within ${Math.round(boundMs / 1000)} s`);
    await pause(200);
  }
}

export class Parts {
  private readonly parts = new Map<string, Part>();
  constructor(
    private readonly logDir: string,
    private readonly boundMs = 5 * 60_000,
  ) {
    mkdirSync(logDir, { recursive: true });
  }

  get(name: string): Part | undefined {
    return this.parts.get(name);
  }

  /** Starts a part (appending to its log) and resolves when it is ready; rejects when it exits first. */
  async start(spec: PartSpec): Promise<Part> {
    const logFile = path.join(this.logDir, `${spec.name}.log`);
    const out = createWriteStream(logFile, { flags: "a" });
    const child: ChildProcess = spawn(spec.command, spec.args, {
      cwd: spec.cwd,
      env: spec.env,
      detached: true,
      stdio: ["ignore", "pipe", "pipe"],
    });
    child.stdout?.pipe(out, { end: false });
    child.stderr?.pipe(out, { end: false });
    let done = false;
    let text = "";
    if (spec.readyLine)
      child.stdout?.on("data", (d: Buffer) => (text = (text + d.toString()).slice(-20_000)));
    const exited = new Promise<number | null>((resolve) =>
      child.once("exit", (code) => ((done = true), resolve(code))),
    );
    const part: Part = { spec, pid: child.pid ?? -1, logFile, alive: () => !done, exited };
    this.parts.set(spec.name, part);
    const ready = async () => {
      if (spec.readyLine) return spec.readyLine.test(text);
      return spec.port !== undefined ? portOpen(spec.port) : true;
    };
    await until(`${spec.name} ready`, async () => done || (await ready()), this.boundMs);
    if (done) {
      const tail = readFileSync(logFile, "utf8").split("\n").slice(-15).join("\n");
      throw new Error(`${spec.name} exited during start-up (log ${logFile}):\n${tail}`);
    }
    return part;
  }

  /** Sends `signal` to the part's process group; resolves when it has exited. */
  async kill(name: string, signal: NodeJS.Signals = "SIGTERM", graceMs = 15_000): Promise<void> {
    const p = this.parts.get(name);
    if (!p || !p.alive()) return;
    const group = (s: NodeJS.Signals) => {
      try {
        process.kill(-p.pid, s);
      } catch {
        /* already gone */
      }
    };
    group(signal);
    const t = setTimeout(() => group("SIGKILL"), graceMs);
    await p.exited;
    clearTimeout(t);
  }

  /** Starts a part again with the spec it had. */
  restart(name: string): Promise<Part> {
    const p = this.parts.get(name);
    if (!p) throw new Error(`no part ${name}`);
    return this.start(p.spec);
  }

  /** Stops every part, the last started first. */
  async stopAll(): Promise<void> {
    for (const name of [...this.parts.keys()].reverse()) await this.kill(name);
  }
}

/** Runs a command to its end (the database script, migrations); throws with its output when it fails. */
export function runStep(what: string, command: string, args: string[], env: NodeJS.ProcessEnv, cwd: string) {
  const r = spawnSync(command, args, { cwd, env, encoding: "utf8", maxBuffer: 64 << 20 });
  if (r.status !== 0)
    throw new Error(`${what} failed (exit ${r.status}):\n${`${r.stdout}\n${r.stderr}`.trim().slice(-3000)}`);
  return r.stdout;
}

/**
 * An instance's first request to a route loads that route's code, a few hundred ms of one core
 * with its event loop held; a deployment warms a new instance before it takes traffic. One
 * request to each route the clients use, without credentials (401 or 404), one at a time.
 */
export async function warmRoutes(port: number): Promise<void> {
  const base = `http://127.0.0.1:${port}`;
  const routes: [string, string][] = [
    ["GET", "/api/v1/me"],
    ["GET", "/api/v1/queue"],
    ["GET", "/api/v1/board"],
    ["GET", "/api/v1/pool/warm-up"],
    ["GET", "/api/v1/batches/warm-up/versions/1/report"],
    ["POST", "/api/v1/batches"],
  ];
  for (const [method, route] of routes)
    await fetch(base + route, { method, signal: AbortSignal.timeout(30_000) })
      .then((r) => r.arrayBuffer())
      .catch(() => undefined);
}

/** The HAProxy configuration of scripts/load/haproxy.cfg with its ports filled in. */
export function haproxyConfig(
  root: string,
  ports: { front: number; appA: number; appB: number; stats: number },
): string {
  return readFileSync(path.join(root, "scripts/load/haproxy.cfg"), "utf8")
    .replaceAll("@FRONT_PORT@", String(ports.front))
    .replaceAll("@APP_A_PORT@", String(ports.appA))
    .replaceAll("@APP_B_PORT@", String(ports.appB))
    .replaceAll("@STATS_PORT@", String(ports.stats));
}

/** The settings of a private loopback stack, from scripts/lib/common.sh's export_loopback_stack. */
export function loopbackEnv(
  root: string,
  appPort: number,
  fakePort: number,
  dbName: string,
  secret: string,
  dataDir: string,
): NodeJS.ProcessEnv {
  const out = runStep(
    "export_loopback_stack",
    "bash",
    [
      "-c",
      'source scripts/lib/common.sh && export_loopback_stack "$@" && env -0',
      "bash",
      String(appPort),
      String(fakePort),
      dbName,
      secret,
      dataDir,
    ],
    process.env,
    root,
  );
  return Object.fromEntries<string>(
    out
      .split("\0")
      .filter(Boolean)
      .map((kv) => [kv.slice(0, kv.indexOf("=")), kv.slice(kv.indexOf("=") + 1)]),
  ) as NodeJS.ProcessEnv;
}
