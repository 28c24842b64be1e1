/**
 * Telling a database outage apart from a real failure, and waiting one out: the worker
 * retries its writes with a bounded back-off while MariaDB is stopped or restarting, so a
 * finished check is stored once the database is back instead of being thrown away.
 */
import { sleep } from "@/lib/sleep";

/** mysql2 / Node error codes that mean "the server is not there (right now)", not "this query is wrong". */
const UNAVAILABLE_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "EPIPE",
  "ETIMEDOUT",
  "EHOSTUNREACH",
  "ENOTFOUND",
  "EAI_AGAIN",
  "PROTOCOL_CONNECTION_LOST",
  "PROTOCOL_ENQUEUE_AFTER_FATAL_ERROR",
  "PROTOCOL_ENQUEUE_AFTER_QUIT",
  "PROTOCOL_SEQUENCE_TIMEOUT",
  "ER_SERVER_SHUTDOWN",
  "ER_CON_COUNT_ERROR",
  "ER_CONNECTION_KILLED",
  "ER_LOCK_DEADLOCK",
  "ER_LOCK_WAIT_TIMEOUT",
]);

/** MariaDB error numbers with the same meaning (server shutting down, connection killed, deadlock, lock wait). */
const UNAVAILABLE_ERRNOS = new Set([1040, 1053, 1205, 1213, 1927, 2002, 2003, 2006, 2013]);

const UNAVAILABLE_MESSAGES = /connection is in closed state|connection lost|server has gone away|pool is closed|socket hang up/i;

/**
 * True when `error` (or any error in its `cause` chain, as Drizzle wraps driver errors)
 * says the database could not be reached or dropped the connection, or the statement lost
 * a deadlock — all worth trying again unchanged.
 */
export function isDbUnavailable(error: unknown): boolean {
  const seen = new Set<unknown>();
  let e: unknown = error;
  while (e && typeof e === "object" && !seen.has(e)) {
    seen.add(e);
    const { code, errno, message } = e as { code?: unknown; errno?: unknown; message?: unknown };
    if (typeof code === "string" && UNAVAILABLE_CODES.has(code)) return true;
    if (typeof errno === "number" && UNAVAILABLE_ERRNOS.has(errno)) return true;
    if (typeof message === "string" && UNAVAILABLE_MESSAGES.test(message) && !("query" in e)) return true;
    if (e instanceof AggregateError && e.errors.some(isDbUnavailable)) return true;
    e = (e as { cause?: unknown }).cause;
  }
  return false;
}

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
      if (tries > 0) opts.log?.(`database back: ${opts.what} succeeded after ${tries} retr${tries === 1 ? "y" : "ies"} (${Date.now() - started} ms)`);
      return value;
    } catch (error) {
      if (!isDbUnavailable(error)) throw error;
      const waited = Date.now() - started;
      if (opts.signal?.aborted || (opts.maxWaitMs !== undefined && waited >= opts.maxWaitMs)) throw error;
      if (tries === 0) opts.log?.(`database unavailable while ${opts.what}; retrying until it is back (${describe(error)})`);
      tries++;
      await sleep(delay, opts.signal);
      delay = Math.min(maxDelay, delay * 2);
    }
  }
}

function describe(error: unknown): string {
  let e: unknown = error;
  while (e && typeof e === "object" && (e as { cause?: unknown }).cause && !(e as { code?: unknown }).code) e = (e as { cause: unknown }).cause;
  const { code, message } = (e ?? {}) as { code?: unknown; message?: unknown };
  return [code, typeof message === "string" ? message.split("\n")[0] : undefined].filter(Boolean).join(": ") || String(error);
}
