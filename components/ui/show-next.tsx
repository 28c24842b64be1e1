"use client";
/** Under a long list: how many rows are shown and "Show the next N" while more follow (the API's `next`). */
import { Button } from "./button";

export function ShowNext({
  shown,
  more,
  pageSize,
  noun,
  busy = false,
  error,
  onNext,
}: {
  shown: number;
  /** whether another page follows */
  more: boolean;
  pageSize: number;
  /** what the rows are, plural: "users", "tokens" */
  noun: string;
  busy?: boolean;
  error?: string | null;
  onNext: () => void;
}) {
  if (!more && !error) return null;
  return (
    <div className="flex flex-wrap items-center gap-2" data-testid="show-next">
      {more ? (
        <Button
          variant="secondary"
          size="sm"
          busy={busy}
          onClick={onNext}
          aria-label={`Show the next ${pageSize} ${noun}`}
        >
          Show the next {pageSize}
        </Button>
      ) : null}
      <span className="text-sm text-silt-ink">
        {shown} {noun} shown{more ? "; more follow." : "."}
      </span>
      {error ? (
        <span className="text-sm text-clay" role="alert">
          The next {noun} could not be loaded: {error}
        </span>
      ) : null}
    </div>
  );
}
