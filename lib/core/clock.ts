/**
 * The time the services stamp on what they write. In the product it is the wall clock; the
 * demo's season builder sets it to invented moments in the past so that uploads, checks,
 * decisions and e-mails carry the dates they would have had (every write still goes through
 * the services). No `server-only` here: the schema's column defaults, the worker and the
 * seed scripts read it too.
 */
let fixed: Date | null = null;

/** The services' "now": the wall clock, or the moment set with setClock. */
export function now(): Date {
  return fixed ? new Date(fixed.getTime()) : new Date();
}

/** Sets the clock to `at` (it stays there until set again); null returns to the wall clock. */
export function setClock(at: Date | null): void {
  fixed = at ? new Date(at.getTime()) : null;
}

/** Moves a set clock on by `ms` (from the wall clock when none is set). */
export function advanceClock(ms: number): Date {
  fixed = new Date(now().getTime() + ms);
  return now();
}
