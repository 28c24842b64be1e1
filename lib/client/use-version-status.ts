"use client";
/** A batch version's state and check progress from the API, polled while the check runs. */
import useSWR from "swr";

export type VersionStatus = {
  batchId: string;
  version: number;
  state: string;
  progress: { rows: number; bytes: number; totalBytes: number };
  reportedAt: string | null;
};

const RUNNING = new Set(["received", "checking"]);

async function fetchStatus(url: string): Promise<VersionStatus> {
  const res = await fetch(url, { headers: { accept: "application/json" } });
  const body = (await res.json().catch(() => null)) as { data?: VersionStatus; error?: { message?: string } } | null;
  if (!res.ok || !body?.data) throw new Error(body?.error?.message ?? `The server answered ${res.status}.`);
  return body.data;
}

export function useVersionStatus(batchId: string, version: number, initialState: string) {
  const running = RUNNING.has(initialState);
  return useSWR<VersionStatus>(running ? `/api/v1/batches/${encodeURIComponent(batchId)}/versions/${version}/report` : null, fetchStatus, {
    refreshInterval: (data) => (data && !RUNNING.has(data.state) ? 0 : 1000),
    revalidateOnFocus: false,
  });
}
