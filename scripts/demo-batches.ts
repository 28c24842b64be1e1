/**
 * `npx tsx --conditions react-server scripts/demo-batches.ts`: builds the demo's season of
 * intake (lib/demo/season-run.ts) after the seed, with the fakes running and before the
 * worker starts. Safe to run again: a season already built is left alone.
 */
import { getDb, getPool } from "@/db/client";
import { buildSeason } from "@/lib/demo/season-run";

try {
  const s = await buildSeason(getDb(), (l) => console.log(`[demo] ${l}`));
  if (s.skipped) console.log("[demo] the season is already in this database; nothing sent.");
} catch (e) {
  console.error(`[demo] could not build the season: ${e instanceof Error ? e.message : String(e)}`);
  process.exitCode = 1;
} finally {
  await getPool().end();
}
