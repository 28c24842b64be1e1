"use client";

import { useEffect } from "react";
import { Button } from "@/components/ui/button";

/** Shown by a segment's error.tsx: what happened, and what to do; never a stack trace. */
export function SegmentError({
  error,
  reset,
  what,
}: {
  error: Error & { digest?: string };
  reset: () => void;
  what: string;
}) {
  useEffect(() => {
    console.error(error);
  }, [error]);
  return (
    <div role="alert" className="max-w-2xl rounded border border-clay/40 bg-clay-wash px-5 py-4">
      <h2 className="text-lg font-semibold text-clay-ink">{what} could not be loaded</h2>
      <p className="mt-1 text-base text-ink">
        Something went wrong on the server. Try again; if it keeps happening, tell your administrator
        {error.digest ? (
          <>
            {" "}
            and quote reference <code className="font-mono text-sm">{error.digest}</code>
          </>
        ) : null}
        .
      </p>
      <Button variant="secondary" size="sm" className="mt-3" onClick={reset}>
        Try again
      </Button>
    </div>
  );
}

type SegmentErrorProps = { error: Error & { digest?: string }; reset: () => void };

/** A segment's error.tsx in one line: `export default errorPage("The board");`. */
export function errorPage(what: string) {
  function ErrorPage({ error, reset }: SegmentErrorProps) {
    return <SegmentError error={error} reset={reset} what={what} />;
  }
  return ErrorPage;
}
