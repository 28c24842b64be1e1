/**
 * One app instance for scale-topology.test.ts: a separate Node process on PORT serving the app's
 * real route handlers for `/api/v1/me` (HAProxy's health check: 401 without credentials) and
 * `/api/v1/board` (a replica read), with DATABASE_URL and DATABASE_REPLICA_URL from the
 * environment. Prints `listening <port>` when ready. Run with `tsx --conditions=react-server`.
 */
import { createServer } from "node:http";
import { GET as getMe } from "@/app/api/v1/me/route";
import { GET as getBoard } from "@/app/api/v1/board/route";

const routes: Record<string, typeof getMe> = { "/api/v1/me": getMe, "/api/v1/board": getBoard };
const port = Number(process.argv[2]);

const server = createServer(async (req, res) => {
  try {
    const url = new URL(req.url ?? "/", "http://127.0.0.1");
    const route = routes[url.pathname];
    if (!route) return void res.writeHead(404).end();
    const headers = new Headers();
    for (const [k, v] of Object.entries(req.headers)) if (typeof v === "string") headers.set(k, v);
    const answer = await route(new Request(url, { headers }), { params: Promise.resolve({}) });
    res
      .writeHead(answer.status, {
        ...Object.fromEntries(answer.headers),
        "x-instance-pid": String(process.pid),
      })
      .end(Buffer.from(await answer.arrayBuffer()));
  } catch (e) {
    console.error(e);
    res.writeHead(500).end(String(e));
  }
});
server.listen(port, "127.0.0.1", () => console.log(`listening ${port}`));
process.on("SIGTERM", () => server.close(() => process.exit(0)));
