/** Recognising MariaDB errors through Drizzle's and mysql2's wrappers. */

/** A unique index refused the row (ER_DUP_ENTRY), anywhere in the cause chain. */
export function isDuplicateKey(e: unknown): boolean {
  for (let c = e as { code?: string; cause?: unknown } | undefined, i = 0; c && i < 4; c = c.cause as typeof c, i++) {
    if (c.code === "ER_DUP_ENTRY") return true;
  }
  return false;
}
