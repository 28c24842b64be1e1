/** `npx tsx scripts/demo-batches.ts`: send the demo batch files through the pipeline and take the demo decisions (after the seed, with the fakes and the worker running). */
import { getDb, getPool } from "@/db/client";
import { decideDemoBatches, sendDemoBatches } from "@/lib/demo/send-batches";

try {
  const n = await sendDemoBatches(getDb(), (l) => console.log(`[demo] ${l}`));
  console.log(`[demo] ${n} demo batch file(s) sent; the worker checks them.`);
  const d = await decideDemoBatches(getDb(), (l) => console.log(`[demo] ${l}`));
  if (d) console.log(`[demo] ${d} demo decision(s) taken by the demo analysts.`);
} catch (e) {
  console.error(`[demo] could not send the demo batches: ${e instanceof Error ? e.message : String(e)}`);
  process.exitCode = 1;
} finally {
  await getPool().end();
}
