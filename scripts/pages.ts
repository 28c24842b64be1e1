/**
 * `npm run pages [-- --url http://127.0.0.1:3470] [--requests 40]`: a measurement, not a test.
 * Signs in through next-auth's credentials form as the demo lead and analyst (password
 * `tributary-demo`), then requests the board, pools, pool, study, plan, queue and a batch
 * page many times each, one at a time, and times each answer to its full HTML (the body read
 * to the end) and to its first byte. Prints p50 and p95 per page against the 150 ms target
 * (on the whole page) and the load average.
 * Run it against a production build (`next build`, then `next start`) on the season's demo.
 */
import os from "node:os";
import { parseArgs } from "node:util";

const { values: opt } = parseArgs({
  options: {
    url: { type: "string", default: "http://127.0.0.1:3470" },
    requests: { type: "string", default: "40" },
  },
});
const BASE = opt.url!.replace(/\/$/, "");
const N = Number(opt.requests);
const PASSWORD = "tributary-demo";
const TARGET_MS = 150;

/** The session cookie after signing in with the credentials form (next-auth v4: csrf, then callback). */
async function signIn(email: string): Promise<string> {
  const csrf = await fetch(`${BASE}/api/auth/csrf`);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const jar = csrf.headers.getSetCookie().map((c) => c.split(";")[0]);
  const r = await fetch(`${BASE}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: jar.join("; ") },
    body: new URLSearchParams({ csrfToken, email, password: PASSWORD, json: "true" }),
  });
  const session = r.headers.getSetCookie().find((c) => c.includes("session-token="));
  if (!session) throw new Error(`signing in as ${email} failed (HTTP ${r.status})`);
  return [...jar, session.split(";")[0]].join("; ");
}

const quantile = (xs: number[], p: number) => {
  const s = [...xs].sort((a, b) => a - b);
  const h = (s.length - 1) * p;
  return s[Math.floor(h)]! + (h - Math.floor(h)) * (s[Math.ceil(h)]! - s[Math.floor(h)]!);
};

/** Milliseconds to the whole page and to its first byte (streamed sections arrive in between). */
async function time(path: string, cookie: string): Promise<{ whole: number[]; first: number[] }> {
  const whole: number[] = [];
  const first: number[] = [];
  for (let i = 0; i <= N; i++) {
    const t = performance.now();
    const r = await fetch(`${BASE}${path}`, { headers: { cookie }, redirect: "manual" });
    const reader = r.body!.getReader();
    const chunks: Uint8Array[] = [];
    let firstAt = 0;
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      if (!firstAt) firstAt = performance.now();
      chunks.push(value);
    }
    const html = Buffer.concat(chunks).toString("utf8");
    if (r.status !== 200) throw new Error(`${path} answered ${r.status}`);
    if (!html.includes("</html>")) throw new Error(`${path} answered without a whole page`);
    if (i > 0) {
      // the first request warms the route
      whole.push(performance.now() - t);
      first.push(firstAt - t);
    }
  }
  return { whole, first };
}

async function main() {
  const lead = await signIn("lead@lowmoor.test");
  const analyst = await signIn("analyst@lowmoor.test");
  const queue = await fetch(`${BASE}/api/v1/queue`, { headers: { cookie: analyst } });
  const items = ((await queue.json()) as { data: { batchId?: string; batchPublicId?: string }[] }).data;
  const batch = items[0]?.batchId ?? items[0]?.batchPublicId;
  const pages: [string, string, string][] = [
    ["board", "/board", lead],
    ["pools", "/pool", analyst],
    ["pool", "/pool/barley-nitrogen", analyst],
    ["study", "/studies/barley-nitrogen", lead],
    ["plan", "/studies/barley-nitrogen/plan", lead],
    ["queue", "/queue", analyst],
    ...(batch ? ([["batch", `/batches/${batch}`, analyst]] as [string, string, string][]) : []),
  ];
  const load = os.loadavg().map((l) => l.toFixed(2));
  console.log(`${BASE}, ${N} requests per page one at a time; load average before: ${load.join(" ")}`);
  console.log("| page | path | p50 ms | p95 ms | first byte p95 ms | target (p95) |");
  console.log("| --- | --- | ---: | ---: | ---: | --- |");
  let missed = 0;
  for (const [name, path, cookie] of pages) {
    const { whole: ms, first } = await time(path, cookie);
    const p95 = quantile(ms, 0.95);
    if (p95 >= TARGET_MS) missed++;
    const cells = [
      name,
      path,
      quantile(ms, 0.5).toFixed(0),
      p95.toFixed(0),
      quantile(first, 0.95).toFixed(0),
      p95 < TARGET_MS ? "met" : "missed",
    ];
    console.log(`| ${cells.join(" | ")} |`);
  }
  console.log(
    `load average after: ${os
      .loadavg()
      .map((l) => l.toFixed(2))
      .join(" ")}`,
  );
  process.exitCode = missed ? 1 : 0;
}

void main();
