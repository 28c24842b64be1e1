"use client";
/** The review queue from the API, refreshed every few seconds and on focus. */
import useSWR from "swr";
import type { QueueItem } from "@/lib/batches/queries-queue";

export type QueueRow = Omit<QueueItem, "uploadedAt" | "since"> & { uploadedAt: string; since: string };

async function fetchQueue(url: string): Promise<QueueRow[]> {
  const res = await fetch(url, { headers: { accept: "application/json" } });
  const body = (await res.json().catch(() => null)) as { data?: QueueRow[]; error?: { message?: string } } | null;
  if (!res.ok || !body?.data) throw new Error(body?.error?.message ?? `The server answered ${res.status}.`);
  return body.data;
}

export function useQueue(initial: QueueRow[]) {
  return useSWR<QueueRow[]>("/api/v1/queue", fetchQueue, { fallbackData: initial, refreshInterval: 5000, revalidateOnFocus: true });
}
