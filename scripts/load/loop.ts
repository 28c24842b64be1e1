/**
 * How long event loops were held up during a run: the load generator's own (so a slow answer
 * is not blamed on the app when the client was the one stalled) and the app's, from the
 * per-second `[loop]` lines that scripts/load/loop-monitor.mjs writes into the app's log.
 */
import { readFileSync } from "node:fs";
import { monitorEventLoopDelay } from "node:perf_hooks";

export interface LoopFigures {
  /** longest stall of the load generator's event loop, ms */
  generatorMaxMs: number;
  /** longest stall of the app's event loop in the window, ms (null: no monitor lines) */
  appMaxMs: number | null;
  /** seconds in the window in which the app's loop stalled for 100 ms or more */
  appSecondsOver100Ms: number;
}

/**
 * Starts watching this process's event loop; call the result to stop and read the longest
 * stall (ms). `seconds`, when given, receives [Date.now(), longest stall in that second] once a
 * second, so a run can line its slow answers up with the generator's own stalls.
 */
export function watchOwnLoop(seconds?: [number, number][]): () => number {
  const h = monitorEventLoopDelay({ resolution: 10 });
  h.enable();
  let max = 0;
  const tick = seconds
    ? setInterval(() => {
        const m = h.max / 1e6;
        max = Math.max(max, m);
        seconds.push([Date.now(), Math.round(m)]);
        h.reset();
      }, 1000).unref()
    : null;
  return () => {
    if (tick) clearInterval(tick);
    h.disable();
    return Math.round(Math.max(max, h.max / 1e6));
  };
}

/** The app's stalls between `from` and `to` (Date.now() clock), read from its log. */
export function appLoopStalls(
  logFile: string,
  from: number,
  to: number,
): { maxMs: number | null; secondsOver100Ms: number } {
  let text = "";
  try {
    text = readFileSync(logFile, "utf8");
  } catch {
    return { maxMs: null, secondsOver100Ms: 0 };
  }
  let max: number | null = null;
  let over = 0;
  for (const m of text.matchAll(/^\[loop\] (\d+) max=(\d+)ms/gm)) {
    const at = Number(m[1]);
    const v = Number(m[2]);
    if (at < from || at > to + 1000) continue;
    max = Math.max(max ?? 0, v);
    if (v >= 100) over++;
  }
  return { maxMs: max, secondsOver100Ms: over };
}
