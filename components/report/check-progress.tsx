"use client";
/** While a version is being checked: rows read and per cent, refreshed from the API; the page reloads its data when the report is in. */
import { useEffect } from "react";
import { useRouter } from "next/navigation";
import { formatCount } from "@/lib/format";
import { useVersionStatus } from "@/lib/client/use-version-status";

export function CheckProgress({
  batchId,
  version,
  state,
}: {
  batchId: string;
  version: number;
  state: string;
}) {
  const router = useRouter();
  const { data, error } = useVersionStatus(batchId, version, state);
  const current = data?.state ?? state;
  useEffect(() => {
    if (data && data.state !== state) router.refresh();
  }, [data, state, router]);
  if (current !== "received" && current !== "checking") return null;
  const pct =
    data && data.progress.totalBytes > 0
      ? Math.min(100, Math.round((data.progress.bytes / data.progress.totalBytes) * 100))
      : null;
  return (
    <div
      className="mb-6 rounded border border-channel/40 bg-channel-wash px-4 py-3"
      aria-live="polite"
      data-testid="check-progress"
    >
      <p className="font-semibold">
        {current === "received"
          ? "Received — waiting for a worker to start the checks."
          : "Checking the batch…"}
      </p>
      <div className="mt-2 flex items-center gap-3 text-sm tabular-nums">
        <progress max={100} value={pct ?? undefined} className="h-2 w-56" aria-label="Check progress" />
        <span>
          {formatCount(data?.progress.rows ?? 0)} rows read{pct !== null ? ` (${pct} %)` : ""}
        </span>
      </div>
      {error ? (
        <p className="mt-1 text-sm text-clay-ink">
          Could not fetch the progress: {error.message} It will be tried again.
        </p>
      ) : null}
    </div>
  );
}
