/**
 * The providers' uploads, sent from a process of their own so that building and writing 20
 * large request bodies never holds up the event loop that times the analysts' requests.
 * Started by scripts/load.ts: builds the bodies, prints {"ready":true}, sends every upload at
 * once when a line arrives on stdin, and prints the outcome as one JSON line.
 *
 *   tsx scripts/load/upload-burst.ts ACCOUNTS.json ORIGIN ROWS TIMEOUT_S
 */
import { readFileSync } from "node:fs";
import { createInterface } from "node:readline";
import type { LoadAccounts } from "./accounts";
import { loadBatch } from "./batches";
import { Recorder } from "./stats";
import { runUploads, type UploadOutcome } from "./traffic";

export interface BurstResult {
  sentAt: number;
  outcomes: UploadOutcome[];
  /** [Date.now() when answered, latency ms, status] per upload */
  samples: [number, number, number][];
  bytes: number;
  socketErrors: number;
  errorSamples: string[];
  csvBytes: number;
}

const [accountsFile, origin, rowsArg, timeoutArg] = process.argv.slice(2);
if (!accountsFile || !origin) throw new Error("usage: upload-burst.ts ACCOUNTS.json ORIGIN ROWS TIMEOUT_S");
const accounts = JSON.parse(readFileSync(accountsFile, "utf8")) as LoadAccounts;
const bodies = accounts.providers.map((p, k) => loadBatch(k, Number(rowsArg), p.token, accounts.studySlug));
console.log(JSON.stringify({ ready: true, csvBytes: bodies[0]?.csvBytes ?? 0 }));

const lines = createInterface({ input: process.stdin });
for await (const _line of lines) {
  const rec = new Recorder();
  const sentAt = Date.now();
  const outcomes = await runUploads(origin, bodies, rec, Number(timeoutArg));
  const f = rec.figures("upload");
  const result: BurstResult = {
    sentAt,
    outcomes,
    samples: rec.samples("upload", 0),
    bytes: f.bytes,
    socketErrors: f.socketErrors,
    errorSamples: f.errorSamples,
    csvBytes: bodies[0]?.csvBytes ?? 0,
  };
  console.log(JSON.stringify(result));
  break;
}
lines.close();
