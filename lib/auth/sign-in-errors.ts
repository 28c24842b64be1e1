/**
 * Sign-in error codes and the messages the sign-in page shows for them. The code travels
 * in `?error=` or in `signIn(..., { redirect: false })`'s `error`; only known codes map to
 * text, so a crafted link cannot put its own words on the page. Safe for client components.
 */
export const SIGN_IN_ERROR = {
  /** next-auth's code when authorize() returns null: wrong e-mail or password */
  wrongCredentials: "CredentialsSignin",
  tooManyAttempts: "TooManyAttempts",
  deactivated: "AccountDeactivated",
} as const;

const MESSAGES: Record<string, string> = {
  [SIGN_IN_ERROR.wrongCredentials]:
    "That e-mail and password do not match an account. Check both and try again.",
  [SIGN_IN_ERROR.tooManyAttempts]:
    "Too many failed sign-ins for this e-mail. Wait 15 minutes and try again, or ask an administrator to reset your password.",
  [SIGN_IN_ERROR.deactivated]: "This account has been deactivated. Ask an administrator to reactivate it.",
  SessionRequired: "Sign in to continue.",
};

/** The message to show for a sign-in error code (null when there is no error). */
export function signInErrorMessage(code: string | null | undefined): string | null {
  if (!code) return null;
  return MESSAGES[code] ?? "Sign-in did not work. Try again.";
}
