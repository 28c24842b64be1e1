"use client";

import { startTransition, useActionState, useEffect, useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, sized } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import { createStudyAction, type CreateStudyState } from "../actions";

const slugify = (s: string) =>
  s
    .toLowerCase()
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 60);

export function NewStudyForm({
  teams,
  defaultTeamId,
}: {
  teams: { id: number; name: string }[];
  defaultTeamId: number | null;
}) {
  const [state, action, pending] = useActionState<CreateStudyState, FormData>(createStudyAction, null);
  const [title, setTitle] = useState("");
  const [slug, setSlug] = useState("");
  const [slugTouched, setSlugTouched] = useState(false);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};

  useEffect(() => {
    if (state && !state.ok && !state.fieldErrors) toast.error(state.message);
  }, [state]);

  const team = teams.some((t) => t.id === defaultTeamId) ? String(defaultTeamId) : "";

  return (
    <form
      noValidate
      aria-label="New study"
      className="flex max-w-xl flex-col gap-4"
      onSubmit={(e) => {
        e.preventDefault();
        const data = new FormData(e.currentTarget);
        startTransition(() => action(data));
      }}
    >
      <Field id="study-title" label="Title" errors={errors.title}>
        <Input
          name="title"
          value={title}
          onChange={(e) => {
            setTitle(e.target.value);
            if (!slugTouched) setSlug(slugify(e.target.value));
          }}
          required
          maxLength={300}
          autoComplete="off"
        />
      </Field>
      <Field
        id="study-slug"
        label="Address"
        hint={<>Lower-case letters, digits and dashes; the study opens at /studies/{slug || "…"}.</>}
        errors={errors.slug}
      >
        <Input
          name="slug"
          value={slug}
          onChange={(e) => {
            setSlugTouched(true);
            setSlug(e.target.value);
          }}
          required
          maxLength={100}
          className="font-mono"
          autoComplete="off"
        />
      </Field>
      <Field
        id="study-description"
        label="Description (optional)"
        hint="What the model is for and who sends data."
        errors={errors.description}
      >
        <textarea name="description" rows={4} maxLength={5000} className={sized("h-auto py-1.5")} />
      </Field>
      <Field id="study-team" label="Run by" errors={errors.teamOrganisationId}>
        <Select name="teamOrganisationId" defaultValue={team}>
          <option value="">your own team</option>
          {teams.map((t) => (
            <option key={t.id} value={t.id}>
              {t.name}
            </option>
          ))}
        </Select>
      </Field>
      <p aria-live="polite" className="text-sm text-clay">
        {state && !state.ok && state.fieldErrors ? state.message : ""}
      </p>
      <div>
        <Button type="submit" busy={pending}>
          Create study
        </Button>
      </div>
    </form>
  );
}
