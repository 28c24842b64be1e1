/**
 * Telling a database outage apart from a real failure, and waiting one out: the worker
 * retries its writes with a bounded back-off while MariaDB is stopped or restarting, so a
 * finished check is stored once the database is back instead of being thrown away.
 */
import { isDbUnavailable } from "@/db/errors";
import { sleep } from "@/lib/sleep";

export interface DbRetryOptions {
  /** what is being written, for the log ("storing the report of job 12") */
  what: string;
  /** stop retrying when this aborts (the last error is thrown) */
  signal?: AbortSignal;
  /** give up after this long (default: never) */
  maxWaitMs?: number;
  /** first pause; doubles up to maxDelayMs */
  firstDelayMs?: number;
  maxDelayMs?: number;
  log?: (line: string) => void;
}

/**
 * Runs `fn`; while it fails because the database is unavailable, waits (200 ms doubling to
 * 5 s by default) and runs it again. Any other error is thrown at once. `fn` must be safe
 * to repeat: a transaction whose COMMIT was cut off may or may not have been applied.
 */
export async function withDbRetry<T>(fn: () => Promise<T>, opts: DbRetryOptions): Promise<T> {
  const started = Date.now();
  let delay = opts.firstDelayMs ?? 200;
  const maxDelay = opts.maxDelayMs ?? 5_000;
  let tries = 0;
  for (;;) {
    try {
      const value = await fn();
      if (tries > 0)
        opts.log?.(
          `database back: ${opts.what} succeeded after ${tries} retr${tries === 1 ? "y" : "ies"} (${Date.now() - started} ms)`,
        );
      return value;
    } catch (error) {
      if (!isDbUnavailable(error)) throw error;
      const waited = Date.now() - started;
      if (opts.signal?.aborted || (opts.maxWaitMs !== undefined && waited >= opts.maxWaitMs)) throw error;
      if (tries === 0)
        opts.log?.(`database unavailable while ${opts.what}; retrying until it is back (${describe(error)})`);
      tries++;
      await sleep(delay, opts.signal);
      delay = Math.min(maxDelay, delay * 2);
    }
  }
}

function describe(error: unknown): string {
  let e: unknown = error;
  while (e && typeof e === "object" && (e as { cause?: unknown }).cause && !(e as { code?: unknown }).code)
    e = (e as { cause: unknown }).cause;
  const { code, message } = (e ?? {}) as { code?: unknown; message?: unknown };
  return (
    [code, typeof message === "string" ? message.split("\n")[0] : undefined].filter(Boolean).join(": ") ||
    String(error)
  );
}
