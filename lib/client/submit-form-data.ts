"use client";
import { startTransition, type FormEvent } from "react";

/**
 * A form's onSubmit for a useActionState action, submitted by hand so React does not clear
 * the fields when the server answers with field errors.
 */
export function submitFormData(action: (data: FormData) => void) {
  return (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const data = new FormData(e.currentTarget);
    startTransition(() => action(data));
  };
}
