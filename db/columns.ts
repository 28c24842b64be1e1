/** Column helpers shared by the schema files (db/schema.ts, db/schema-records.ts). */
import { sql } from "drizzle-orm";
import { datetime, int } from "drizzle-orm/mysql-core";
import { now } from "../lib/core/clock";

export const id = () => int("id", { unsigned: true }).autoincrement().primaryKey();
export const ref = (name: string) => int(name, { unsigned: true });
/**
 * A moment column that defaults to the services' clock (lib/core/clock.ts) on every insert
 * through Drizzle, and to CURRENT_TIMESTAMP(3) for SQL typed by hand.
 */
export const stamped = (name: string) =>
  datetime(name, { mode: "date", fsp: 3 })
    .notNull()
    .default(sql`CURRENT_TIMESTAMP(3)`)
    .$defaultFn(() => now());
export const created = () => stamped("created_at");
