import type { InputHTMLAttributes } from "react";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";

type Props = {
  id: string;
  label: string;
  minLength: number;
  errors: string[] | undefined;
} & Omit<InputHTMLAttributes<HTMLInputElement>, "id" | "type" | "minLength">;

/** A password being chosen: the minimum length said beside it and asked of the browser too. */
export function NewPasswordField({ id, label, minLength, errors, ...input }: Props) {
  return (
    <Field id={id} label={label} hint={`At least ${minLength} characters.`} errors={errors}>
      <Input type="password" autoComplete="new-password" required minLength={minLength} {...input} />
    </Field>
  );
}
