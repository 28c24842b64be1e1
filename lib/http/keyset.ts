/**
 * Keyset pagination for the list queries (batches, queue, audit trail, tokens, users): a page is
 * the rows strictly after the last row of the one before, in an order whose last column is unique,
 * so every row comes exactly once however many pages are read — no OFFSET, which skips or repeats
 * rows when the list changes between calls and reads every earlier row again.
 * The cursor that carries a key over HTTP is lib/http/page.ts.
 */
import { and, eq, gt, lt, or, type Column, type SQL, type SQLWrapper } from "drizzle-orm";

/** The kinds of value a sort key is made of (how a cursor is checked when it comes back). */
export type KeyPart = "date" | "int" | "text";
export type KeyValue = Date | number | string;

/** A list that pages: its name (a cursor of another list is refused) and its sort key's parts. */
export type KeysetList<K extends KeyValue[]> = {
  name: string;
  parts: { [I in keyof K]: K[I] extends Date ? "date" : K[I] extends number ? "int" : "text" };
};

export function keysetList<K extends KeyValue[]>(name: string, parts: KeysetList<K>["parts"]): KeysetList<K> {
  return { name, parts };
}

/** What a list query is asked for: at most `limit` rows after the key `after` (from the start without it). */
export type PageRequest<K> = { after?: K; limit: number };

/** A page of rows and the key of its last row when more follow (null on the last page). */
export type Page<T, K> = { rows: T[]; nextKey: K | null };

/**
 * The condition "after `key`" in the order of `columns`, all ascending or all descending:
 * c1 > k1 OR (c1 = k1 AND c2 > k2) OR … (the row comparison written out, so each value is bound
 * with its column's own encoding, e.g. a moment as the UTC text the column stores).
 */
export function afterKey(
  columns: (Column | SQLWrapper)[],
  key: KeyValue[] | undefined,
  direction: "asc" | "desc",
): SQL | undefined {
  if (!key) return undefined;
  const beyond = direction === "asc" ? gt : lt;
  return or(
    ...columns.map((c, i) =>
      and(...columns.slice(0, i).map((p, j) => eq(p as Column, key[j])), beyond(c as Column, key[i])),
    ),
  );
}

/** How many rows to ask the database for: one more than the page, to learn whether another follows. */
export const rowsToRead = (limit: number) => limit + 1;

/** The page out of the rows read with rowsToRead(limit). */
export function pageOf<T, K>(rows: T[], limit: number, keyOf: (row: T) => K): Page<T, K> {
  if (rows.length <= limit) return { rows, nextKey: null };
  const kept = rows.slice(0, limit);
  return { rows: kept, nextKey: keyOf(kept[kept.length - 1]!) };
}
