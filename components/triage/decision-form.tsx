"use client";
/**
 * The analyst's decision on a version, compact enough for the summary bar: an overall comment and
 * the two buttons; the comments on findings are written on the findings' own rows (review-context).
 */
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import type { Finding } from "@/lib/readiness";
import type { Result } from "@/lib/result";
import type { DecisionDone, DecisionInput } from "@/lib/batches/commands-decide";
import { useReview } from "./review-context";

type Props = {
  batchId: string;
  version: number;
  findings: Finding[];
  canAccept: boolean;
  decide: (batchId: string, version: number, input: DecisionInput) => Promise<Result<DecisionDone>>;
};

/** Set when a decision is made, read once by the "Next in queue" link to take the focus. */
export const DECIDED_KEY = "tributary:decided";

export function DecisionForm({ batchId, version, findings, canAccept, decide }: Props) {
  const router = useRouter();
  const review = useReview();
  const [comment, setComment] = useState("");
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [pending, start] = useTransition();
  const commented = Object.values(review?.comments ?? {}).filter((t) => t.trim()).length;

  function submit(decision: "accept" | "bounce") {
    const findingComments = Object.entries(review?.comments ?? {})
      .filter(([, text]) => text.trim())
      .flatMap(([i, text]) => {
        const f = findings[Number(i)];
        return f ? [{ code: f.code, columns: f.columns, comment: text.trim() }] : [];
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
        sessionStorage.setItem(DECIDED_KEY, batchId);
        router.refresh();
      } else {
        setErrors(r.fieldErrors ?? {});
        toast.error(r.message);
        if (r.code === "conflict") router.refresh();
      }
    });
  }

  const problems = [...(errors.comment ?? []), ...(errors.findingComments ?? [])];
  return (
    <form
      className="flex flex-wrap items-start gap-2"
      onSubmit={(e) => e.preventDefault()}
      aria-label="Decision"
      data-testid="decision-form"
    >
      <div className="grid min-w-64 flex-1 gap-0.5">
        <label htmlFor="decision-comment" className="text-xs font-semibold text-ink-soft">
          Comment to the provider
          <span className="font-normal text-silt-ink">
            {" "}
            ·{" "}
            {commented
              ? `and ${commented} on findings`
              : "required to bounce unless you comment on a finding"}
          </span>
        </label>
        <textarea
          id="decision-comment"
          className="h-14 w-full resize-y rounded border border-silt bg-white px-2 py-1 text-sm focus:outline-2 focus:outline-channel"
          rows={2}
          value={comment}
          onChange={(e) => setComment(e.target.value)}
          maxLength={5000}
          aria-invalid={problems.length ? true : undefined}
          aria-describedby={problems.length ? "decision-problems" : undefined}
        />
        {problems.length ? (
          <p id="decision-problems" className="text-sm text-clay" aria-live="polite">
            {problems.join(" ")}
          </p>
        ) : null}
      </div>
      <div className="flex items-center gap-2 self-end">
        <Button variant="danger" onClick={() => submit("bounce")} busy={pending} data-testid="bounce-button">
          Bounce to the provider
        </Button>
        {canAccept ? (
          <Button onClick={() => submit("accept")} busy={pending} data-testid="accept-button">
            Accept into the pool
          </Button>
        ) : null}
      </div>
    </form>
  );
}
