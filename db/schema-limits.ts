/**
 * Counters of the rate limits (lib/auth/rate-limit.ts), shared by every app instance. The
 * columns and their order are the ones rate-limiter-flexible's MySQL store writes
 * (`INSERT … VALUES (key, points, expire)`); keys are a limit's name and a hash of what it
 * counts, so no e-mail or address is stored here.
 */
import { bigint, int, mysqlTable, varchar } from "drizzle-orm/mysql-core";

export const rateLimits = mysqlTable("rate_limits", {
  key: varchar("key", { length: 255 }).primaryKey(),
  points: int("points").notNull().default(0),
  /** when the window ends, in epoch milliseconds; null for a counter that never expires */
  expire: bigint("expire", { mode: "number", unsigned: true }),
});
