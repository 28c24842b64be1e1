/**
 * One "app instance" for rate-limits-instances.test.ts: a separate Node process on a free
 * loopback port, serving the app's own code against the database in DATABASE_URL —
 * `POST /sign-in` runs the credentials check next-auth's provider runs (authorizeCredentials),
 * and `/api/v1/me` is the real route handler. Prints `listening <port>` when ready.
 * Run with `tsx --conditions=react-server` (the server-only marker resolves to its empty module).
 */
import { createServer } from "node:http";
import { authorizeCredentials, SignInRefused } from "@/lib/auth/credentials";
import { GET as getMe } from "@/app/api/v1/me/route";

async function body(req: import("node:http").IncomingMessage): Promise<string> {
  const parts: Buffer[] = [];
  for await (const p of req) parts.push(p as Buffer);
  return Buffer.concat(parts).toString("utf8");
}

const server = createServer(async (req, res) => {
  try {
    if (req.method === "POST" && req.url === "/sign-in") {
      const { email, password, ip } = JSON.parse(await body(req)) as {
        email: string;
        password: string;
        ip: string;
      };
      let outcome: string;
      try {
        outcome = (await authorizeCredentials({ email, password }, { ip })) ? "signed-in" : "wrong";
      } catch (e) {
        if (!(e instanceof SignInRefused)) throw e;
        outcome = e.message;
      }
      res
        .writeHead(200, { "content-type": "application/json" })
        .end(JSON.stringify({ outcome, pid: process.pid }));
      return;
    }
    if (req.url === "/api/v1/me") {
      const headers = new Headers();
      for (const [k, v] of Object.entries(req.headers)) if (typeof v === "string") headers.set(k, v);
      const answer = await getMe(new Request(`http://127.0.0.1${req.url}`, { headers }), {
        params: Promise.resolve({}),
      });
      res
        .writeHead(answer.status, Object.fromEntries(answer.headers))
        .end(Buffer.from(await answer.arrayBuffer()));
      return;
    }
    res.writeHead(404).end();
  } catch (e) {
    console.error(e);
    res.writeHead(500).end(String(e));
  }
});

server.listen(0, "127.0.0.1", () => {
  const address = server.address();
  console.log(`listening ${typeof address === "object" && address ? address.port : ""}`);
});
process.on("SIGTERM", () => server.close(() => process.exit(0)));
