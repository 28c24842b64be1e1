"use client";

import { SegmentError } from "@/components/portal/segment-states";

export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return <SegmentError error={error} reset={reset} what="This page" />;
}
