/**
 * Sign-in throttling: sliding windows of failed attempts, one per e-mail + client address and
 * one per e-mail from any address. The second bounds guessing on one account by someone who
 * varies the address (X-Forwarded-For is whatever the client sends when the app is not behind
 * a proxy that sets it), at the price that such a person can hold the account back for the
 * window.
 *
 * Kept in this process's memory, which is right for one app instance (the demo and the
 * tests). Several instances behind a load balancer would each keep their own windows, so a
 * deployment like that needs a shared store (a database table or Redis) behind the same API.
 */
export const SIGN_IN_LIMIT = { maxFailures: 10, maxFailuresPerAccount: 30, windowMs: 15 * 60 * 1000 } as const;

const failures = new Map<string, number[]>();
const MAX_KEYS = 10_000;

function keyOf(email: string, ip: string): string {
  return `${email.trim().toLowerCase()}|${ip}`;
}

// a NUL cannot come in a header, so this key never meets one of keyOf's
const accountKeyOf = (email: string) => `account\u0000${email.trim().toLowerCase()}`;

function recent(key: string, now: number): number[] {
  const list = (failures.get(key) ?? []).filter((t) => now - t < SIGN_IN_LIMIT.windowMs);
  if (list.length === 0) failures.delete(key);
  else failures.set(key, list);
  return list;
}

function blockedFor(list: number[], max: number, now: number): number | null {
  if (list.length < max) return null;
  const oldest = list[list.length - max] ?? now;
  return Math.max(1, Math.ceil((oldest + SIGN_IN_LIMIT.windowMs - now) / 1000));
}

/** Whether another attempt is allowed now; when not, how many seconds until one is. */
export function checkSignInAllowed(email: string, ip: string, now = Date.now()): { allowed: true } | { allowed: false; retryAfterSeconds: number } {
  const here = blockedFor(recent(keyOf(email, ip), now), SIGN_IN_LIMIT.maxFailures, now);
  const anywhere = blockedFor(recent(accountKeyOf(email), now), SIGN_IN_LIMIT.maxFailuresPerAccount, now);
  if (here === null && anywhere === null) return { allowed: true };
  return { allowed: false, retryAfterSeconds: Math.max(here ?? 0, anywhere ?? 0) };
}

/** Counts a failed attempt for the e-mail from this address, and for the e-mail from anywhere. */
export function recordSignInFailure(email: string, ip: string, now = Date.now()): void {
  if (failures.size >= MAX_KEYS) prune(now);
  for (const key of [keyOf(email, ip), accountKeyOf(email)]) {
    const list = recent(key, now);
    list.push(now);
    failures.set(key, list);
  }
}

/**
 * A successful sign-in clears the window for that e-mail and address. The account's window
 * stays: a guesser elsewhere is not let off because the owner signed in.
 */
export function clearSignInFailures(email: string, ip: string): void {
  failures.delete(keyOf(email, ip));
}

function prune(now: number): void {
  for (const key of [...failures.keys()]) recent(key, now);
  // still full: drop the oldest keys rather than grow without bound
  for (const key of failures.keys()) {
    if (failures.size < MAX_KEYS) break;
    failures.delete(key);
  }
}

/** For tests only. */
export function resetSignInLimiter(): void {
  failures.clear();
}
