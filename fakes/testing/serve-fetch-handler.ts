/** Serves a fetch-style handler `(Request) => Promise<Response>` on node:http, for tests. */
import { createServer, type IncomingMessage } from "node:http";
import type { AddressInfo } from "node:net";
import { Readable } from "node:stream";

export type ServedHandler = { url: string; close(): Promise<void> };

function toRequest(req: IncomingMessage, base: string): Request {
  const headers = new Headers();
  for (const [k, v] of Object.entries(req.headers)) {
    if (Array.isArray(v)) v.forEach((x) => headers.append(k, x));
    else if (v !== undefined) headers.set(k, v);
  }
  const hasBody = req.method !== "GET" && req.method !== "HEAD";
  return new Request(new URL(req.url ?? "/", base), {
    method: req.method,
    headers,
    body: hasBody ? (Readable.toWeb(req) as ReadableStream<Uint8Array>) : undefined,
    duplex: "half",
  } as RequestInit);
}

export async function serveFetchHandler(
  handler: (req: Request) => Promise<Response>,
  port = 0,
): Promise<ServedHandler> {
  let base = "";
  const server = createServer((req, res) => {
    handler(toRequest(req, base))
      .then(async (r) => {
        res.writeHead(r.status, Object.fromEntries(r.headers));
        if (r.body) for await (const c of r.body) res.write(c);
        res.end();
      })
      .catch((e: unknown) => {
        res.writeHead(500, { "content-type": "text/plain" });
        res.end(String((e as Error)?.stack ?? e));
      });
  });
  await new Promise<void>((resolve) => server.listen(port, "127.0.0.1", () => resolve()));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  return {
    url: base,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
