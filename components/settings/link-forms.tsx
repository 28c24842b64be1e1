"use client";
/** Forms of the one-time links: ask for a reset link; choose a password through a link. */
import { useState, useTransition, type FormEvent, type TransitionStartFunction } from "react";
import Link from "next/link";
import { Button } from "@/components/ui/button";
import { NewPasswordField } from "@/components/settings/new-password-field";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import type { Result } from "@/lib/result";

/** What a link form says once it is done. */
function Done({ children }: { children: React.ReactNode }) {
  return (
    <p role="status" className="rounded border border-reed/40 bg-reed-wash px-3 py-2 text-base text-reed-ink">
      {children}
    </p>
  );
}

/** An onSubmit that runs `send` in a transition, so the button shows it is busy. */
function inTransition(start: TransitionStartFunction, send: () => Promise<void>) {
  return (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    start(send);
  };
}

export function ForgotPasswordForm({ request }: { request: (email: string) => Promise<Result<null>> }) {
  const [email, setEmail] = useState("");
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [sent, setSent] = useState(false);
  const [pending, start] = useTransition();
  if (sent) {
    return (
      <Done>
        If {email} has an active account, a link to choose a new password is on its way. It works once, for
        one hour.
      </Done>
    );
  }
  return (
    <form
      className="grid grid-cols-1 gap-4"
      noValidate
      onSubmit={inTransition(start, async () => {
        const r = await request(email);
        if (r.ok) setSent(true);
        else setErrors(r.fieldErrors ?? { email: [r.message] });
      })}
    >
      <Field id="email" label="E-mail" errors={errors.email}>
        <Input
          type="email"
          autoComplete="email"
          value={email}
          onChange={(e) => setEmail(e.target.value)}
          required
        />
      </Field>
      <Button type="submit" busy={pending}>
        Send me a link
      </Button>
      <Link href="/sign-in" className="text-sm text-channel underline">
        Back to sign-in
      </Link>
    </form>
  );
}

export function SetPasswordForm({
  token,
  minLength,
  save,
}: {
  token: string;
  minLength: number;
  save: (token: string, p: string, c: string) => Promise<Result<{ email: string }>>;
}) {
  const [password, setPassword] = useState("");
  const [confirm, setConfirm] = useState("");
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [done, setDone] = useState(false);
  const [pending, start] = useTransition();
  if (done) {
    return (
      <Done>
        Your password is set.{" "}
        <Link href="/sign-in" className="underline">
          Sign in
        </Link>
        .
      </Done>
    );
  }
  return (
    <form
      className="grid grid-cols-1 gap-4"
      noValidate
      onSubmit={inTransition(start, async () => {
        const r = await save(token, password, confirm);
        if (r.ok) setDone(true);
        else {
          setErrors(r.fieldErrors ?? {});
          setMessage(r.fieldErrors ? null : r.message);
        }
      })}
    >
      <NewPasswordField
        id="password"
        label="New password"
        minLength={minLength}
        errors={errors.password}
        value={password}
        onChange={(e) => setPassword(e.target.value)}
      />
      <Field id="confirm" label="New password again" errors={errors.confirmPassword}>
        <Input
          type="password"
          autoComplete="new-password"
          value={confirm}
          onChange={(e) => setConfirm(e.target.value)}
          required
        />
      </Field>
      <p aria-live="polite" className="text-sm text-clay">
        {message}
      </p>
      <Button type="submit" busy={pending}>
        Set password
      </Button>
    </form>
  );
}
