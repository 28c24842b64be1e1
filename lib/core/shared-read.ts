/**
 * Request coalescing ("single flight") for a read that many users ask for at once and that
 * answers everyone the same: a call that comes while the same read (same key) is already
 * running joins it and gets its answer, instead of running the same queries again beside it.
 * Nothing is kept once the read settles, so the next call after it reads afresh: this is not a
 * cache, and an answer is never older than the read that produced it. A failed read fails
 * every caller that joined it, and the next call tries again.
 *
 * A caller that joins gets an answer whose queries began before it arrived, by at most
 * `joinWithinMs` (a change committed in between shows on the next read). A read that has run
 * longer than that is not joined: a new one starts, so a stuck query does not hold every later
 * caller. Callers share one object and must not change it.
 */
export interface SharedRead<A, T> {
  (arg: A): Promise<T>;
  /** reads running now (for tests and diagnostics) */
  running(): number;
}

export function sharedRead<A, T>(
  read: (arg: A) => Promise<T>,
  opts: {
    /** the same read for the same key (default: the argument itself, for a string or number) */
    keyOf?: (arg: A) => string | number;
    joinWithinMs?: number;
    now?: () => number;
  } = {},
): SharedRead<A, T> {
  const keyOf = opts.keyOf ?? ((arg: A) => arg as string | number);
  const joinWithinMs = opts.joinWithinMs ?? 1000;
  const now = opts.now ?? Date.now;
  const flights = new Map<string | number, { startedAt: number; answer: Promise<T> }>();
  const shared = (arg: A): Promise<T> => {
    const key = keyOf(arg);
    const flight = flights.get(key);
    if (flight && now() - flight.startedAt <= joinWithinMs) return flight.answer;
    let answer: Promise<T>;
    try {
      answer = read(arg);
    } catch (e) {
      answer = Promise.reject(e);
    }
    const mine = { startedAt: now(), answer };
    flights.set(key, mine);
    const done = () => {
      if (flights.get(key) === mine) flights.delete(key);
    };
    answer.then(done, done);
    return answer;
  };
  return Object.assign(shared, { running: () => flights.size });
}
