"use client";

import { useActionState, useEffect, useRef } from "react";
import { signOut } from "next-auth/react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { submitFormData } from "@/lib/client/submit-form-data";
import { useHydrated } from "@/lib/client/use-hydrated";
import { NewPasswordField } from "@/components/settings/new-password-field";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { changePasswordAction, type ChangePasswordState } from "./actions";

export function PasswordForm({ minLength }: { minLength: number }) {
  const hydrated = useHydrated();
  const [state, action, pending] = useActionState<ChangePasswordState, FormData>(changePasswordAction, null);
  const formRef = useRef<HTMLFormElement>(null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};

  useEffect(() => {
    if (!state) return;
    if (state.ok) {
      formRef.current?.reset();
      toast.success("Password changed. Sign in again with the new password.");
      // the change ended this session on the server: leave cleanly
      const t = setTimeout(async () => {
        await signOut({ redirect: false });
        window.location.assign("/sign-in?notice=password-changed");
      }, 1200);
      return () => clearTimeout(t);
    }
    if (!state.fieldErrors) toast.error(state.message);
  }, [state]);

  return (
    <form
      method="post"
      ref={formRef}
      onSubmit={submitFormData(action)}
      noValidate
      className="flex max-w-sm flex-col gap-4"
      aria-label="Change your password"
    >
      <Field id="current-password" label="Current password" errors={errors.currentPassword}>
        <Input name="currentPassword" type="password" autoComplete="current-password" required />
      </Field>
      <NewPasswordField
        id="new-password"
        label="New password"
        name="newPassword"
        minLength={minLength}
        errors={errors.newPassword}
      />
      <Field id="confirm-password" label="New password again" errors={errors.confirmPassword}>
        <Input name="confirmPassword" type="password" autoComplete="new-password" required />
      </Field>
      <p aria-live="polite" className="text-sm text-clay">
        {state && !state.ok && state.fieldErrors ? state.message : ""}
      </p>
      <div>
        <Button type="submit" disabled={!hydrated} busy={pending}>
          Change password
        </Button>
      </div>
    </form>
  );
}
