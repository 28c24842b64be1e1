"use client";
/** After a decision: the next batch waiting in the reviewer's queue, one click (or Enter) away. */
import { useEffect, useRef } from "react";
import Link from "next/link";
import { DECIDED_KEY } from "./decision-form";

export function NextInQueue({ next }: { next: { batchId: string; title: string } | null }) {
  const ref = useRef<HTMLAnchorElement>(null);
  useEffect(() => {
    // only right after this reviewer's decision, not on every visit to a decided batch
    if (sessionStorage.getItem(DECIDED_KEY)) {
      sessionStorage.removeItem(DECIDED_KEY);
      ref.current?.focus();
    }
  }, []);
  return (
    <Link
      ref={ref}
      href={next ? `/batches/${next.batchId}` : "/analyst"}
      className="inline-flex h-9 items-center rounded border border-channel bg-channel px-3.5 font-semibold text-white hover:bg-channel-deep focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-ink"
      data-testid="next-in-queue"
    >
      {next ? `Next in queue: ${next.title} →` : "Queue is empty: back to the review queue"}
    </Link>
  );
}
