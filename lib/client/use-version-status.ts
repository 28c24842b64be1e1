"use client";
/** A batch version's state and check progress from the API, polled while the check runs. */
import useSWR from "swr";
import { fetchApiData } from "./fetcher";

export type VersionStatus = {
  batchId: string;
  version: number;
  state: string;
  progress: { rows: number; bytes: number; totalBytes: number };
  reportedAt: string | null;
};

const RUNNING = new Set(["received", "checking"]);

export function useVersionStatus(batchId: string, version: number, initialState: string) {
  const running = RUNNING.has(initialState);
  return useSWR<VersionStatus>(
    running ? `/api/v1/batches/${encodeURIComponent(batchId)}/versions/${version}/report` : null,
    fetchApiData<VersionStatus>,
    {
      refreshInterval: (data) => (data && !RUNNING.has(data.state) ? 0 : 1000),
      revalidateOnFocus: false,
    },
  );
}
