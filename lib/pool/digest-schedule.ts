/**
 * The weekly digest on a schedule: every `intervalMs` the worker asks whether this week's
 * digest is due (Monday from 07:00 UTC on) and queues it; the week's dedupe key makes
 * every further attempt that week, by any worker, a no-op.
 */
import { sendDigest } from "./digest-send";
import { sleep } from "@/lib/sleep";

/** Whether the weekly digest is due at `now`: any moment from Monday 07:00 UTC to the week's end. */
export function digestDue(now: Date): boolean {
  const day = now.getUTCDay(); // 0 = Sunday
  return day !== 1 || now.getUTCHours() >= 7;
}

export async function runDigestSchedule(opts: {
  signal: AbortSignal;
  intervalMs?: number;
  log?: (line: string) => void;
}): Promise<void> {
  const interval = opts.intervalMs ?? 15 * 60_000;
  const log = opts.log ?? (() => {});
  while (!opts.signal.aborted) {
    const now = new Date();
    if (digestDue(now)) {
      try {
        const r = await sendDigest({ actorId: null, now, reason: "weekly" });
        if (r.ok && r.data.queued > 0) log(`weekly digest queued for ${r.data.queued} lead(s)`);
      } catch (e) {
        log(`weekly digest failed: ${e instanceof Error ? e.message : String(e)}`);
      }
    }
    await sleep(interval, opts.signal);
  }
}
