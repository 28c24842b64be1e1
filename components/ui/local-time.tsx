"use client";

import { useSyncExternalStore } from "react";
import { formatDate, formatDateTime, formatLocalDateTime, isoDateTime, isoSeconds } from "@/lib/format";

const noChange = () => () => {};

/** false while the server renders and during hydration, true afterwards: the viewer's zone is known. */
function useInBrowser(): boolean {
  return useSyncExternalStore(
    noChange,
    () => true,
    () => false,
  );
}

/**
 * A timestamp in the viewer's own time zone, with the UTC time (ISO 8601) on hover. The server
 * and the first client render print UTC, so hydration matches; the local time follows at once.
 */
export function LocalTime({
  value,
  dateOnly = false,
  className,
}: {
  value: Date | string | number | null | undefined;
  dateOnly?: boolean;
  className?: string;
}) {
  const inBrowser = useInBrowser();
  const iso = isoDateTime(value);
  if (!iso) return <span className={className}>–</span>;
  const text = inBrowser
    ? formatLocalDateTime(value, { dateOnly })
    : dateOnly
      ? formatDate(value)
      : formatDateTime(value);
  return (
    <time dateTime={iso} title={`${isoSeconds(value)} (UTC)`} className={className}>
      {text}
    </time>
  );
}
