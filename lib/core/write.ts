/**
 * The one way a change reaches the database: `write()` loads the acting user from the database
 * (not from the session, so a demotion or a deactivation bites at the next change), checks the
 * role against the role → actions table (lib/auth/permissions.ts), parses the input with its
 * zod schema, then runs the body in one transaction and gives it `audit()` for the audit rows,
 * which land in the same transaction. A body that answers a failure rolls the
 * transaction back, so a refused change leaves nothing behind.
 *
 * Whatever the body throws becomes a Result: an AppError keeps its safe message, code and
 * field errors; anything else is logged and answered plainly (lib/errors.ts toAppError).
 * No "server-only" here: the worker and the demo script run writes too.
 */
import type { z } from "zod";
import { getDb, type Tx } from "@/db/client";
import { isDuplicateKey } from "@/db/errors";
import { can, type Action } from "@/lib/auth/permissions";
import { AppError, toAppError } from "@/lib/errors";
import { fail, fieldErrorsOf, type Result } from "@/lib/result";
import { loadActor, type Actor } from "./actor";
import { recordAudit, type AuditEntry } from "./audit";

/** Writes one audit row in the write's transaction; the actor is the write's unless given. */
export type Audit = (entry: Omit<AuditEntry, "actorId"> & { actorId?: number | null }) => Promise<void>;

export type WriteContext<I, A> = { tx: Tx; actor: A; input: I; audit: Audit };

type Issues = ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>;

type Common<S extends z.ZodType, T, A> = {
  /** names the write in the server log when it fails unexpectedly */
  name: string;
  schema: S;
  input: unknown;
  /** the answer to input that does not parse: a message (field errors added), or a function of the issues */
  invalid?: string | ((issues: Issues) => Result<T>);
  /** the answer when a unique key refuses the change (two people doing the same thing at once) */
  onDuplicate?: () => Result<T> | Promise<Result<T>>;
  run: (ctx: WriteContext<z.output<S>, A>) => Promise<Result<T>>;
};

/** A change by a signed-in user, who needs one of the actions `may` ("signed-in": any active user). */
export type UserWrite<S extends z.ZodType, T> = Common<S, T, Actor> & {
  actorId: number;
  may: Action | readonly Action[] | "signed-in";
  /** the answer when the role lacks the action (default: "Your role does not allow this.") */
  forbidden?: string;
};

/** A change with no signed-in user: a visitor with a one-time link, or the worker's schedule. */
export type AnonymousWrite<S extends z.ZodType, T> = Common<S, T, null> & { actorId: null; may: "anyone" };

export const CHECK_FIELDS = "Check the highlighted fields.";

/** A failed Result thrown out of the transaction, so that it rolls back. */
class Refused {
  constructor(readonly result: Result<never>) {}
}

function invalidResult<T>(invalid: Common<z.ZodType, T, unknown>["invalid"], issues: Issues): Result<T> {
  if (typeof invalid === "function") return invalid(issues);
  return fail(invalid ?? CHECK_FIELDS, fieldErrorsOf(issues));
}

function allowed(actor: Actor, may: UserWrite<z.ZodType, unknown>["may"]): boolean {
  if (may === "signed-in") return true;
  return (typeof may === "string" ? [may] : may).some((a) => can(actor.role, a));
}

export function write<S extends z.ZodType, T>(w: UserWrite<S, T>): Promise<Result<T>>;
export function write<S extends z.ZodType, T>(w: AnonymousWrite<S, T>): Promise<Result<T>>;
export async function write<S extends z.ZodType, T>(
  w: UserWrite<S, T> | AnonymousWrite<S, T>,
): Promise<Result<T>> {
  try {
    const db = getDb();
    // the house order: who is acting (401), may their role do this (403), then the input (422).
    // The actor is read before the transaction opens: under REPEATABLE READ a transaction's
    // snapshot starts at its first plain read, and the body's locking reads must come first.
    let actor: Actor | null = null;
    if (w.actorId !== null) {
      actor = await loadActor(db, w.actorId);
      if (!allowed(actor, w.may)) throw new AppError("forbidden", w.forbidden);
    }
    const parsed = w.schema.safeParse(w.input);
    if (!parsed.success) return invalidResult(w.invalid, parsed.error.issues);
    const actorId = actor?.id ?? null;
    return await db.transaction(async (tx) => {
      const audit: Audit = (entry) =>
        recordAudit(tx, { ...entry, actorId: entry.actorId === undefined ? actorId : entry.actorId });
      const ctx = { tx, actor, input: parsed.data, audit };
      const result = await (w.run as (c: typeof ctx) => Promise<Result<T>>)(ctx);
      if (!result.ok) throw new Refused(result as Result<never>);
      return result;
    });
  } catch (e) {
    if (e instanceof Refused) return e.result;
    if (w.onDuplicate && isDuplicateKey(e)) return w.onDuplicate();
    const err = e instanceof AppError ? e : toAppError(e, w.name);
    const failed = fail<T>(err.message, err.fieldErrors, err.code);
    if (err.retryAfterSeconds === undefined || failed.ok) return failed;
    return { ...failed, retryAfterSeconds: err.retryAfterSeconds };
  }
}

/** A failed Result as a throw, for a body that finds out deep inside that it must refuse. */
export function refuse(result: Result<unknown>): never {
  if (result.ok) throw new Error("refuse() needs a failed Result");
  throw new Refused(result);
}
