"use client";

import { useState, useTransition } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, sized } from "@/components/ui/input";
import { updateStudyAction } from "./actions";

/** Close or reopen a study, and edit its title and description (study.manage). */
export function StudyStatus({
  slug,
  title,
  description,
  status,
}: {
  slug: string;
  title: string;
  description: string | null;
  status: "open" | "closed";
}) {
  const [pending, startTransition] = useTransition();
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [t, setT] = useState(title);
  const [d, setD] = useState(description ?? "");

  function run(change: Parameters<typeof updateStudyAction>[1], success: string) {
    startTransition(async () => {
      const r = await updateStudyAction(slug, change);
      if (r.ok) {
        setErrors({});
        toast.success(success);
      } else {
        setErrors(r.fieldErrors ?? {});
        if (!r.fieldErrors) toast.error(r.message);
      }
    });
  }

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center gap-3">
        {status === "open" ? (
          <Button
            variant="danger"
            size="sm"
            busy={pending}
            onClick={() =>
              run({ status: "closed" }, "The study is closed: no new batches are accepted for upload.")
            }
          >
            Close the study
          </Button>
        ) : (
          <Button
            variant="secondary"
            size="sm"
            busy={pending}
            onClick={() => run({ status: "open" }, "The study is open for uploads again.")}
          >
            Reopen the study
          </Button>
        )}
        <span className="text-sm text-silt-ink">
          {status === "open"
            ? "Admitted providers can upload batches."
            : "Closed: uploads are refused; reports and decisions stay."}
        </span>
      </div>
      <details className="max-w-xl">
        <summary className="cursor-pointer text-sm font-semibold text-channel">
          Edit the title and description
        </summary>
        <form
          className="mt-2 flex flex-col gap-3"
          onSubmit={(e) => {
            e.preventDefault();
            run({ title: t, description: d }, "The study is updated.");
          }}
        >
          <Field id="edit-title" label="Title" errors={errors.title}>
            <Input value={t} onChange={(e) => setT(e.target.value)} maxLength={300} />
          </Field>
          <Field id="edit-description" label="Description" errors={errors.description}>
            <textarea
              value={d}
              onChange={(e) => setD(e.target.value)}
              rows={4}
              maxLength={5000}
              className={sized("h-auto py-1.5")}
            />
          </Field>
          <div>
            <Button type="submit" size="sm" busy={pending}>
              Save
            </Button>
          </div>
        </form>
      </details>
    </div>
  );
}
