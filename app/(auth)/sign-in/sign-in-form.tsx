"use client";

import { useState, type FormEvent } from "react";
import { signIn } from "next-auth/react";
import { Button } from "@/components/ui/button";
import { useHydrated } from "@/lib/client/use-hydrated";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { SIGN_IN_ERROR, signInErrorMessage } from "@/lib/auth/sign-in-errors";

/** One message for wrong e-mail, wrong password and a deactivated account: none tells which. */
export const WRONG_CREDENTIALS = "E-mail or password is wrong, or the account is deactivated.";

function messageFor(code: string | null | undefined): string | null {
  if (!code) return null;
  if (code === SIGN_IN_ERROR.tooManyAttempts) return signInErrorMessage(code);
  if (code === "SessionRequired") return "Sign in to continue.";
  if (code === SIGN_IN_ERROR.wrongCredentials || code === SIGN_IN_ERROR.deactivated) return WRONG_CREDENTIALS;
  return "Sign-in did not work. Try again in a moment.";
}

export function SignInForm({ next, initialError }: { next: string; initialError: string | null }) {
  const hydrated = useHydrated();
  const [error, setError] = useState<string | null>(messageFor(initialError));
  const [busy, setBusy] = useState(false);

  async function onSubmit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const email = String(form.get("email") ?? "").trim();
    const password = String(form.get("password") ?? "");
    if (!email || !password) {
      setError("Enter your e-mail address and your password.");
      return;
    }
    setBusy(true);
    setError(null);
    try {
      const res = await signIn("credentials", { email, password, redirect: false });
      if (!res || res.error || !res.ok) {
        setError(messageFor(res?.error ?? "unknown"));
        setBusy(false);
        return;
      }
      // a full navigation so the server renders the portal with the new session cookie
      window.location.assign(next);
    } catch {
      setError("The server could not be reached. Check your connection and try again.");
      setBusy(false);
    }
  }

  return (
    <form
      method="post"
      onSubmit={onSubmit}
      noValidate
      className="flex flex-col gap-4"
      aria-describedby="sign-in-error"
    >
      <Field id="email" label="E-mail">
        <Input name="email" type="email" autoComplete="username" required autoFocus />
      </Field>
      <Field id="password" label="Password">
        <Input name="password" type="password" autoComplete="current-password" required />
      </Field>
      <div className="mt-2">
        <div
          id="sign-in-error"
          role="alert"
          aria-live="assertive"
          className={
            error ? "mb-4 rounded border border-clay/40 bg-clay-wash px-3 py-2 text-sm text-clay-ink" : ""
          }
        >
          {error}
        </div>
        <Button type="submit" disabled={!hydrated} busy={busy} className="w-full">
          {busy ? "Signing in" : "Sign in"}
        </Button>
      </div>
    </form>
  );
}
