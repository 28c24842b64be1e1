"use client";

import { useActionState, useEffect, useRef, useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { submitFormData } from "@/lib/client/submit-form-data";
import { useHydrated } from "@/lib/client/use-hydrated";
import { NewPasswordField } from "@/components/settings/new-password-field";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import { ROLES, type UserRole } from "@/db/schema";
import { roleLabel } from "@/lib/format";
import { createUserAction, type CreateUserState } from "./actions";

type Org = { id: number; name: string; kind: "provider" | "team" };

export function CreateUserForm({
  organisations,
  passwordMinLength,
}: {
  organisations: Org[];
  passwordMinLength: number;
}) {
  const hydrated = useHydrated();
  const [state, action, pending] = useActionState<CreateUserState, FormData>(createUserAction, null);
  const [role, setRole] = useState<UserRole>("provider");
  const formRef = useRef<HTMLFormElement>(null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};

  useEffect(() => {
    if (!state) return;
    if (state.ok) {
      toast.success(`Account created for ${state.data.email}.`);
      formRef.current?.reset();
      setRole("provider");
    } else if (!state.fieldErrors) {
      toast.error(state.message);
    }
  }, [state]);

  // providers belong to a provider organisation; the others to a study team
  const choices = organisations.filter((o) =>
    role === "provider" ? o.kind === "provider" : o.kind === "team",
  );

  return (
    <form
      method="post"
      ref={formRef}
      onSubmit={submitFormData(action)}
      noValidate
      className="grid max-w-4xl gap-4 sm:grid-cols-2 lg:grid-cols-3"
      aria-label="Create a user"
    >
      <Field id="new-name" label="Name" errors={errors.name}>
        <Input name="name" autoComplete="off" required maxLength={200} />
      </Field>
      <Field id="new-email" label="E-mail" errors={errors.email}>
        <Input name="email" type="email" autoComplete="off" required maxLength={320} />
      </Field>
      <Field id="new-role" label="Role" errors={errors.role}>
        <Select name="role" value={role} onChange={(e) => setRole(e.target.value as UserRole)}>
          {ROLES.map((r) => (
            <option key={r} value={r}>
              {roleLabel(r)}
            </option>
          ))}
        </Select>
      </Field>
      <Field id="new-organisation" label="Organisation" errors={errors.organisationId}>
        <Select name="organisationId" defaultValue="" key={role}>
          <option value="">{role === "provider" ? "Choose…" : "None"}</option>
          {choices.map((o) => (
            <option key={o.id} value={o.id}>
              {o.name}
            </option>
          ))}
        </Select>
      </Field>
      <NewPasswordField
        id="new-password"
        label="First password"
        name="password"
        minLength={passwordMinLength}
        errors={errors.password}
      />
      <div className="flex items-end gap-3 self-start pt-6">
        <Button type="submit" disabled={!hydrated} busy={pending}>
          Create user
        </Button>
      </div>
      <p aria-live="polite" className="text-sm text-clay sm:col-span-2 lg:col-span-3">
        {state && !state.ok && state.fieldErrors
          ? `${state.message}${errors._form ? ` ${errors._form.join(" ")}` : ""}`
          : ""}
      </p>
    </form>
  );
}
