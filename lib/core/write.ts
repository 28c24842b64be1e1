import "server-only";
import { AppError, toAppError } from "@/lib/errors";
import { fail, type Result } from "@/lib/result";

/**
 * Runs a service body and turns what it throws into the Result shape: an AppError keeps
 * its safe message, code and field errors; anything else is logged and reported plainly.
 */
export async function runService<T>(name: string, body: () => Promise<Result<T>>): Promise<Result<T>> {
  try {
    return await body();
  } catch (e) {
    const err = e instanceof AppError ? e : toAppError(e, name);
    return fail(err.message, err.fieldErrors, err.code);
  }
}

export { isDuplicateKey } from "@/db/errors";
