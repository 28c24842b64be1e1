/**
 * Network pieces for the fault tests: a gate in front of the upload fake's file downloads
 * that can hold a download mid-file until the test lets it go (so "mid-file" is a fact, not
 * a race), a switch in front of the whole service that can take it down or cut uploads
 * mid-body, and storing a file in the fake the way the app does.
 */
import { createServer, request, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import type { AddressInfo, Socket } from "node:net";
import { UTFile } from "uploadthing/server";
import { createUtapi } from "@/lib/batches/intake/file-store";

type Served = { url: string; port: number; close(): Promise<void> };

async function listen(server: Server, sockets: Set<Socket>): Promise<Served> {
  server.on("connection", (s) => {
    sockets.add(s);
    s.on("close", () => sockets.delete(s));
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => resolve());
  });
  const port = (server.address() as AddressInfo).port;
  return {
    url: `http://127.0.0.1:${port}`,
    port,
    close: () =>
      new Promise<void>((resolve) => {
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
  };
}

function forward(
  req: IncomingMessage,
  target: URL,
  onResponse: (up: IncomingMessage) => void,
  res: ServerResponse,
): ReturnType<typeof request> {
  // the Host header is kept: the fake checks signatures over the URL as the client addressed it
  const up = request(
    { host: target.hostname, port: target.port, method: req.method, path: req.url, headers: req.headers },
    onResponse,
  );
  up.on("error", () => res.destroy());
  return up;
}

export type FileGate = Served & {
  /** downloads started through the gate */
  downloads: number;
  /** hold the next download after `bytes` bytes; resolves when it has reached that point */
  holdNext(bytes: number): Promise<void>;
  /** let a held download go on */
  release(): void;
};

/** A pass-through proxy for file downloads (GET /a/… and /f/…) that can hold one mid-file. */
export async function startFileGate(targetUrl: string): Promise<FileGate> {
  const target = new URL(targetUrl);
  let armed: { bytes: number; reached: () => void } | null = null;
  let releasers: (() => void)[] = [];
  const sockets = new Set<Socket>();
  const gate = { downloads: 0 } as FileGate;
  const server = createServer((req, res) => {
    const isDownload = req.method === "GET" && /^\/(a|f)\//.test(req.url ?? "");
    if (isDownload) gate.downloads++;
    const hold = isDownload ? armed : null;
    if (hold) armed = null;
    const up = forward(
      req,
      target,
      (down) => {
        res.writeHead(down.statusCode ?? 502, down.headers);
        if (!hold) return void down.pipe(res);
        let sent = 0;
        let state: "before" | "held" | "after" = "before";
        down.on("data", (chunk: Buffer) => {
          if (state === "before" && sent + chunk.length >= hold.bytes) {
            const rest = chunk.subarray(hold.bytes - sent);
            res.write(chunk.subarray(0, hold.bytes - sent));
            sent += chunk.length;
            state = "held";
            down.pause();
            hold.reached();
            releasers.push(() => {
              if (res.destroyed) return;
              state = "after";
              res.write(rest);
              down.resume();
            });
            return;
          }
          sent += chunk.length;
          if (!res.write(chunk)) {
            down.pause();
            res.once("drain", () => state !== "held" && down.resume());
          }
        });
        down.on("end", () => res.end());
        res.on("close", () => down.destroy());
      },
      res,
    );
    req.pipe(up);
  });
  const served = await listen(server, sockets);
  return Object.assign(gate, served, {
    holdNext: (bytes: number) =>
      new Promise<void>((resolve) => {
        armed = { bytes, reached: resolve };
      }),
    release: () => {
      const r = releasers;
      releasers = [];
      for (const f of r) f();
    },
  });
}

export type ServiceSwitch = Served & {
  /** stop listening: connections to the service's address are refused, open ones cut */
  down(): Promise<void>;
  /** listen again on the same port */
  up(): Promise<void>;
  /** cut every upload (PUT) after this many body bytes; null lets them through */
  dropPutsAfter: number | null;
  /** uploads cut so far */
  dropped: number;
};

/**
 * The upload service's address as the app sees it: forwards to the fake at `targetUrl`, and
 * can go down (refusing connections, like a stopped service) or cut uploads mid-body.
 */
export async function startServiceSwitch(targetUrl: string): Promise<ServiceSwitch> {
  const target = new URL(targetUrl);
  const sockets = new Set<Socket>();
  const sw = { dropPutsAfter: null, dropped: 0 } as unknown as ServiceSwitch;
  const server = createServer((req, res) => {
    const up = forward(
      req,
      target,
      (down) => {
        res.writeHead(down.statusCode ?? 502, down.headers);
        down.pipe(res);
      },
      res,
    );
    const limit = sw.dropPutsAfter;
    if (req.method !== "PUT" || limit === null) return void req.pipe(up);
    let seen = 0;
    req.on("data", (chunk: Buffer) => {
      seen += chunk.length;
      if (seen <= limit) return void up.write(chunk);
      if (req.socket.destroyed) return;
      sw.dropped++;
      up.destroy();
      req.socket.destroy();
    });
    req.on("end", () => up.end());
  });
  const served = await listen(server, sockets);
  return Object.assign(sw, served, {
    down: () =>
      new Promise<void>((resolve) => {
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
    up: () =>
      new Promise<void>((resolve, reject) => {
        server.once("error", reject);
        server.listen(served.port, "127.0.0.1", () => resolve());
      }),
  });
}

/** Stores `csv` in the upload service at `serviceUrl` as the app does (private attachment); returns key and URL. */
export async function storeFile(
  serviceUrl: string,
  token: string,
  csv: string,
  name: string,
): Promise<{ key: string; url: string; name: string; size: number }> {
  const api = createUtapi({ token, apiUrl: serviceUrl, ingestUrl: serviceUrl });
  const bytes = new TextEncoder().encode(csv);
  const r = await api.uploadFiles(new UTFile([bytes], name, { type: "text/csv" }), {
    acl: "private",
    contentDisposition: "attachment",
  });
  if (r.error || !r.data) throw new Error(`storing ${name} in the upload fake failed: ${r.error?.message}`);
  return { key: r.data.key, url: r.data.ufsUrl, name, size: bytes.length };
}
