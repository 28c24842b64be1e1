/**
 * Rate limits, counted in the database (table `rate_limits`, db/schema-limits.ts) through
 * rate-limiter-flexible's MySQL store, so every app instance shares them and a restart
 * forgets nothing. Each limit is a fixed window of `points` per `duration` seconds, keyed by
 * a sha-256 of what it counts (an e-mail, a client address, a token id). Nothing is evicted:
 * a counter ends only when its window does, so filling the table with made-up keys cannot
 * reset anyone's counter, and only a successful sign-in clears one — its own e-mail at its
 * own address.
 *
 * The client address comes from X-Forwarded-For, which any client can set when the app is not
 * behind a proxy that overwrites it; the per-account and per-target limits hold regardless.
 */
import { createHash } from "node:crypto";
import type { Pool } from "mysql2/promise";
import { RateLimiterMySQL, RateLimiterRes } from "rate-limiter-flexible";
import { getPool } from "@/db/client";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";

const MINUTE = 60;

/** The sign-in windows (failed attempts only). */
export const SIGN_IN_LIMIT = {
  maxFailures: 10,
  maxFailuresPerAccount: 30,
  maxFailuresPerAddress: 100,
  windowMs: 15 * 60 * 1000,
} as const;

/** Every limit: points per duration (seconds). */
export const LIMITS = {
  /** failed sign-ins for one e-mail from one address */
  signInPair: { points: SIGN_IN_LIMIT.maxFailures, duration: SIGN_IN_LIMIT.windowMs / 1000 },
  /** failed sign-ins for one e-mail from anywhere */
  signInAccount: { points: SIGN_IN_LIMIT.maxFailuresPerAccount, duration: SIGN_IN_LIMIT.windowMs / 1000 },
  /** failed sign-ins from one address, whatever the e-mail */
  signInAddress: { points: SIGN_IN_LIMIT.maxFailuresPerAddress, duration: SIGN_IN_LIMIT.windowMs / 1000 },
  /** wrong current passwords when changing one's password, per account */
  passwordChange: { points: 10, duration: 15 * MINUTE },
  /** password-reset requests from one address, and for one e-mail */
  resetPerAddress: { points: 20, duration: 60 * MINUTE },
  resetPerTarget: { points: 3, duration: 60 * MINUTE },
  /** invitations sent from one address, and to one e-mail */
  invitePerAddress: { points: 50, duration: 60 * MINUTE },
  invitePerTarget: { points: 3, duration: 24 * 60 * MINUTE },
  /** API calls with one personal token (API_RATE_LIMIT_PER_MINUTE, 600 by default) */
  apiPerToken: { points: 600, duration: MINUTE },
} as const;

export type LimitName = keyof typeof LIMITS;

type Limiters = Record<LimitName, RateLimiterMySQL>;
const byPool = new WeakMap<Pool, Limiters>();

function databaseName(): string {
  const name = decodeURIComponent(new URL(env().DATABASE_URL).pathname.replace(/^\//, ""));
  if (!name) throw new Error("DATABASE_URL names no database");
  return name;
}

function limiters(): Limiters {
  const pool = getPool();
  let found = byPool.get(pool);
  if (!found) {
    const dbName = databaseName();
    const make = (name: LimitName) => {
      const points = name === "apiPerToken" ? env().API_RATE_LIMIT_PER_MINUTE : LIMITS[name].points;
      // the table comes from the migrations; mysql2/promise's pool wraps the callback pool the store uses
      return new RateLimiterMySQL({
        storeClient: pool.pool,
        storeType: "pool",
        dbName,
        tableName: "rate_limits",
        tableCreated: true,
        keyPrefix: name,
        points,
        duration: LIMITS[name].duration,
      });
    };
    found = Object.fromEntries((Object.keys(LIMITS) as LimitName[]).map((n) => [n, make(n)])) as Limiters;
    byPool.set(pool, found);
  }
  return found;
}

const keyOf = (subject: string) =>
  createHash("sha256").update(subject.trim().toLowerCase(), "utf8").digest("hex");
const seconds = (ms: number) => Math.max(1, Math.ceil(ms / 1000));

export type Gate = { allowed: true } | { allowed: false; retryAfterSeconds: number };

/** Whether the counter is below its limit, without counting. */
export async function peekLimit(name: LimitName, subject: string): Promise<Gate> {
  const l = limiters()[name];
  const res = await l.get(keyOf(subject));
  if (!res || res.consumedPoints < l.points) return { allowed: true };
  return { allowed: false, retryAfterSeconds: seconds(res.msBeforeNext) };
}

/** Counts one event whatever the limit says (a failure already happened). */
export async function countEvent(name: LimitName, subject: string): Promise<void> {
  await limiters()[name].penalty(keyOf(subject), 1);
}

/** Counts one request; when it is over the limit, says how long until the window ends. */
export async function takeLimit(name: LimitName, subject: string): Promise<Gate> {
  try {
    await limiters()[name].consume(keyOf(subject), 1);
    return { allowed: true };
  } catch (e) {
    if (e instanceof RateLimiterRes) return { allowed: false, retryAfterSeconds: seconds(e.msBeforeNext) };
    throw e;
  }
}

/** Ends a counter's window early; only for the caller's own counter (see clearSignInFailures). */
export async function clearLimit(name: LimitName, subject: string): Promise<void> {
  await limiters()[name].delete(keyOf(subject));
}

/** "3 minutes", "1 minute", "40 seconds": for the messages. */
export function waitText(retryAfterSeconds: number): string {
  if (retryAfterSeconds < 90) return `${retryAfterSeconds} seconds`;
  const m = Math.ceil(retryAfterSeconds / 60);
  return m >= 90 ? `${Math.ceil(m / 60)} hours` : `${m} minutes`;
}

/** Counts one request against each limit in turn; the first that is full throws AppError("rate_limited"). */
export async function requireWithinLimits(
  checks: { name: LimitName; subject: string }[],
  what: string,
): Promise<void> {
  for (const c of checks) {
    const gate = await takeLimit(c.name, c.subject);
    if (!gate.allowed) {
      throw new AppError(
        "rate_limited",
        `Too many ${what}. Try again in ${waitText(gate.retryAfterSeconds)}.`,
        { retryAfterSeconds: gate.retryAfterSeconds },
      );
    }
  }
}

const pair = (email: string, ip: string) => `${email.trim().toLowerCase()}\u0000${ip}`;

/** Whether another sign-in attempt is allowed now; when not, how many seconds until one is. */
export async function checkSignInAllowed(email: string, ip: string): Promise<Gate> {
  const gates = await Promise.all([
    peekLimit("signInPair", pair(email, ip)),
    peekLimit("signInAccount", email),
    peekLimit("signInAddress", ip),
  ]);
  const waits = gates.flatMap((g) => (g.allowed ? [] : [g.retryAfterSeconds]));
  return waits.length === 0 ? { allowed: true } : { allowed: false, retryAfterSeconds: Math.max(...waits) };
}

/** Counts a failed attempt for the e-mail from this address, for the e-mail, and for the address. */
export async function recordSignInFailure(email: string, ip: string): Promise<void> {
  await Promise.all([
    countEvent("signInPair", pair(email, ip)),
    countEvent("signInAccount", email),
    countEvent("signInAddress", ip),
  ]);
}

/**
 * A successful sign-in clears the window of that e-mail at that address, and nothing else: a
 * guesser elsewhere is not let off because the owner signed in, and an address's count stays.
 */
export async function clearSignInFailures(email: string, ip: string): Promise<void> {
  await clearLimit("signInPair", pair(email, ip));
}

/** For tests only: empties every counter of this database. */
export async function resetRateLimits(): Promise<void> {
  await getPool().query("DELETE FROM rate_limits");
}
