"use client";
/** The analyst's decision on a version: accept or bounce, an overall comment, comments on findings. */
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { SeverityShape } from "@/components/severity-badge";
import type { Finding } from "@/lib/readiness";
import type { Result } from "@/lib/result";
import type { DecisionDone, DecisionInput } from "@/lib/batches/commands-decide";

type Props = {
  batchId: string;
  version: number;
  findings: Finding[];
  canAccept: boolean;
  decide: (batchId: string, version: number, input: DecisionInput) => Promise<Result<DecisionDone>>;
};

const textareaClass =
  "w-full rounded border border-silt bg-white px-2.5 py-1.5 text-base focus:outline-2 focus:outline-channel";

export function DecisionForm({ batchId, version, findings, canAccept, decide }: Props) {
  const router = useRouter();
  const [comment, setComment] = useState("");
  const [perFinding, setPerFinding] = useState<Record<number, string>>({});
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [pending, start] = useTransition();

  function submit(decision: "accept" | "bounce") {
    const findingComments = Object.entries(perFinding)
      .filter(([, text]) => text.trim())
      .map(([i, text]) => {
        const f = findings[Number(i)]!;
        return { code: f.code, columns: f.columns, comment: text.trim() };
      });
    start(async () => {
      const r = await decide(batchId, version, { decision, comment, findingComments });
      if (r.ok) {
        toast.success(
          r.data.state === "accepted"
            ? `Accepted. ${r.data.emailsQueued} e-mail(s) to the provider queued.`
            : `Bounced. ${r.data.emailsQueued} e-mail(s) with your comments queued.`,
        );
        setErrors({});
        router.refresh();
      } else {
        setErrors(r.fieldErrors ?? {});
        toast.error(r.message);
        if (r.code === "conflict") router.refresh();
      }
    });
  }

  return (
    <form
      className="grid gap-4"
      onSubmit={(e) => e.preventDefault()}
      aria-label="Decision"
      data-testid="decision-form"
    >
      <Field
        id="decision-comment"
        label="Comment to the provider"
        hint="Sent by e-mail with the decision. Required to bounce unless you comment on a finding."
        errors={errors.comment}
      >
        <textarea
          className={textareaClass}
          rows={3}
          value={comment}
          onChange={(e) => setComment(e.target.value)}
          maxLength={5000}
        />
      </Field>
      {findings.length ? (
        <details
          className="rounded border border-silt-line bg-white px-3 py-2"
          open={findings.some((f) => f.severity === "blocker")}
        >
          <summary className="cursor-pointer text-sm font-semibold">
            Comment on findings ({findings.length})
          </summary>
          <ul className="mt-2 grid gap-3">
            {findings.map((f, i) => (
              <li key={i} className="grid gap-1">
                <label htmlFor={`fc-${i}`} className="flex gap-2 text-sm">
                  <SeverityShape severity={f.severity} className="mt-1 shrink-0" />
                  <span>
                    <code className="text-xs">{f.code}</code>
                    {f.columns.length ? (
                      <span className="font-mono text-xs"> ({f.columns.join(", ")})</span>
                    ) : null}{" "}
                    — {f.message}
                  </span>
                </label>
                <textarea
                  id={`fc-${i}`}
                  data-finding-code={f.code}
                  className={textareaClass}
                  rows={1}
                  value={perFinding[i] ?? ""}
                  maxLength={2000}
                  onChange={(e) => setPerFinding({ ...perFinding, [i]: e.target.value })}
                />
              </li>
            ))}
          </ul>
          {errors.findingComments ? (
            <p className="text-sm text-clay" aria-live="polite">
              {errors.findingComments.join(" ")}
            </p>
          ) : null}
        </details>
      ) : null}
      <div className="flex flex-wrap items-center gap-3">
        <Button variant="danger" onClick={() => submit("bounce")} busy={pending} data-testid="bounce-button">
          Bounce to the provider
        </Button>
        {canAccept ? (
          <Button onClick={() => submit("accept")} busy={pending} data-testid="accept-button">
            Accept into the pool
          </Button>
        ) : null}
        <p className="text-xs text-silt-ink">
          The decision is final for this version and recorded in the audit trail with your name.
        </p>
      </div>
    </form>
  );
}
