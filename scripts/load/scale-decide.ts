/**
 * The analysts' decisions in the scale run, through the service the batch page's action and the
 * decision route call (decideVersion): every version of the load study that is ready for review
 * is decided by the analyst of the same number as its provider — even providers accepted, odd ones
 * bounced with a comment. Polls every second until stdin closes; prints `{"ready":true}` once
 * its first round is done (so the run can start it before the measured window: its own start-up
 * is a second or two of a core, which is no part of the app's load), then one JSON line per
 * decision. A decision the database refused while it restarted is tried again next round.
 *
 *   tsx --conditions=react-server scripts/load/scale-decide.ts ACCOUNTS.json
 */
import { readFileSync } from "node:fs";
import { and, eq, inArray, isNull } from "drizzle-orm";
import { getDb, getPool } from "@/db/client";
import { batches, batchVersions, decisions, organisations, studies, users } from "@/db/schema";
import { decideVersion } from "@/lib/batches";
import type { LoadAccounts } from "./accounts";

const accounts = JSON.parse(readFileSync(process.argv[2]!, "utf8")) as LoadAccounts;
let open = true;
process.stdin.on("end", () => (open = false)).resume();
const db = getDb();
const analystIds = new Map<string, number>();

async function round(): Promise<void> {
  if (analystIds.size === 0)
    for (const u of await db
      .select({ id: users.id, email: users.email })
      .from(users)
      .where(
        inArray(
          users.email,
          accounts.analysts.map((a) => a.email),
        ),
      ))
      analystIds.set(u.email, u.id);
  const ready = await db
    .select({ publicId: batches.publicId, version: batchVersions.version, org: organisations.slug })
    .from(batchVersions)
    .innerJoin(batches, eq(batches.id, batchVersions.batchId))
    .innerJoin(studies, eq(studies.id, batches.studyId))
    .innerJoin(organisations, eq(organisations.id, batches.organisationId))
    .leftJoin(decisions, eq(decisions.batchVersionId, batchVersions.id))
    .where(and(eq(studies.slug, accounts.studySlug), eq(batchVersions.state, "ready"), isNull(decisions.id)));
  for (const v of ready) {
    const k = accounts.providers.findIndex((p) => p.organisation === v.org);
    const analyst = accounts.analysts[k % accounts.analysts.length]!;
    const accept = k % 2 === 0;
    const r = await decideVersion(analystIds.get(analyst.email)!, v.publicId, v.version, {
      decision: accept ? "accept" : "bounce",
      comment: accept ? "" : "Load test: please send this batch again.",
    });
    console.log(JSON.stringify({ batch: v.publicId, k, ok: r.ok, message: r.ok ? "" : r.message }));
  }
}

let first = true;
while (open) {
  try {
    await round();
  } catch (e) {
    console.log(JSON.stringify({ retry: e instanceof Error ? e.message : String(e) }));
  }
  if (first) console.log(JSON.stringify({ ready: true }));
  first = false;
  await new Promise((r) => setTimeout(r, 1000));
}
await getPool().end();
