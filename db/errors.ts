/** Recognising MariaDB errors through Drizzle's and mysql2's wrappers. */

/** A unique index refused the row (ER_DUP_ENTRY), anywhere in the cause chain. */
export function isDuplicateKey(e: unknown): boolean {
  for (
    let c = e as { code?: string; cause?: unknown } | undefined, i = 0;
    c && i < 4;
    c = c.cause as typeof c, i++
  ) {
    if (c.code === "ER_DUP_ENTRY") return true;
  }
  return false;
}

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

const UNAVAILABLE_MESSAGES =
  /connection is in closed state|connection lost|server has gone away|pool is closed|socket hang up/i;

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
