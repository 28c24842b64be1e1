/** Column helpers shared by the schema files (db/schema.ts, db/schema-records.ts). */
import { sql } from "drizzle-orm";
import { datetime, int } from "drizzle-orm/mysql-core";

export const id = () => int("id", { unsigned: true }).autoincrement().primaryKey();
export const ref = (name: string) => int(name, { unsigned: true });
export const created = () =>
  datetime("created_at", { mode: "date", fsp: 3 })
    .notNull()
    .default(sql`CURRENT_TIMESTAMP(3)`);
