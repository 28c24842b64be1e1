"use client";
/** The review queue from the API, refreshed every few seconds and on focus. */
import useSWR from "swr";
import { fetchApiData } from "./fetcher";
import type { QueueItem } from "@/lib/batches/queries-queue";

export type QueueRow = Omit<QueueItem, "uploadedAt" | "since"> & { uploadedAt: string; since: string };

export function useQueue(initial: QueueRow[]) {
  return useSWR<QueueRow[]>("/api/v1/queue", fetchApiData<QueueRow[]>, {
    fallbackData: initial,
    refreshInterval: 5000,
    revalidateOnFocus: true,
  });
}
