"use client";
/**
 * The review queue from the API, a page at a time (`next`, lib/http/page.ts), every page shown
 * refreshed every few seconds and on focus; `showNext` adds the page after the last.
 */
import useSWRInfinite from "swr/infinite";
import { fetchApiPage, type ListPage } from "./fetcher";
import type { QueueItem } from "@/lib/batches/queries-queue";

export type QueueRow = Omit<QueueItem, "uploadedAt" | "since"> & { uploadedAt: string; since: string };

export function useQueue(initial: ListPage<QueueRow>) {
  const { data, error, size, setSize, isValidating } = useSWRInfinite<ListPage<QueueRow>>(
    (index, before: ListPage<QueueRow> | null) => (index === 0 ? "/api/v1/queue" : (before?.next ?? null)),
    fetchApiPage<QueueRow>,
    { fallbackData: [initial], refreshInterval: 5000, revalidateOnFocus: true },
  );
  const pages = data ?? [initial];
  return {
    rows: pages.flatMap((p) => p.data),
    next: pages[pages.length - 1]?.next ?? null,
    error: error as Error | undefined,
    busy: isValidating && size > pages.length,
    showNext: () => void setSize(size + 1),
  };
}
