/** Password hashing with bcrypt (bcryptjs: pure JS, no native build). */
import bcrypt from "bcryptjs";

export { PASSWORD_MIN_LENGTH } from "./password-rules";
const COST = 10;

export function hashPassword(plain: string): Promise<string> {
  return bcrypt.hash(plain, COST);
}

/** Compares in constant time; a missing hash (account without a password yet) never matches. */
export async function verifyPassword(plain: string, hash: string | null | undefined): Promise<boolean> {
  if (!hash) {
    // spend comparable time so response timing does not tell whether an account exists
    await bcrypt.compare(plain, DUMMY_HASH);
    return false;
  }
  return bcrypt.compare(plain, hash);
}

// bcrypt of a random string, cost 10 like real hashes: only used to even out timing
const DUMMY_HASH = "$2b$10$FuRoLmF6eDaYI7fggi/gKu80mxNgxJLqjWuSjgVNNmTFeRwU0dVtC";
