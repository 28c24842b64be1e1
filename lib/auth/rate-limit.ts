/**
 * Sign-in throttling: a sliding window of failed attempts per e-mail + client address.
 *
 * Kept in this process's memory, which is right for one app instance (the demo and the
 * tests). Several instances behind a load balancer would each keep their own window, so a
 * deployment like that needs a shared store (a database table or Redis) behind the same API.
 */
export const SIGN_IN_LIMIT = { maxFailures: 10, windowMs: 15 * 60 * 1000 } as const;

const failures = new Map<string, number[]>();
const MAX_KEYS = 10_000;

function keyOf(email: string, ip: string): string {
  return `${email.trim().toLowerCase()}|${ip}`;
}

function recent(key: string, now: number): number[] {
  const list = (failures.get(key) ?? []).filter((t) => now - t < SIGN_IN_LIMIT.windowMs);
  if (list.length === 0) failures.delete(key);
  else failures.set(key, list);
  return list;
}

/** Whether another attempt is allowed now; when not, how many seconds until one is. */
export function checkSignInAllowed(email: string, ip: string, now = Date.now()): { allowed: true } | { allowed: false; retryAfterSeconds: number } {
  const list = recent(keyOf(email, ip), now);
  if (list.length < SIGN_IN_LIMIT.maxFailures) return { allowed: true };
  const oldest = list[list.length - SIGN_IN_LIMIT.maxFailures] ?? now;
  return { allowed: false, retryAfterSeconds: Math.max(1, Math.ceil((oldest + SIGN_IN_LIMIT.windowMs - now) / 1000)) };
}

export function recordSignInFailure(email: string, ip: string, now = Date.now()): void {
  if (failures.size >= MAX_KEYS) prune(now);
  const key = keyOf(email, ip);
  const list = recent(key, now);
  list.push(now);
  failures.set(key, list);
}

/** A successful sign-in clears the window for that e-mail and address. */
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
