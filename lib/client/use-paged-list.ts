"use client";
/**
 * A list the server rendered one page of, grown a page at a time from the API's `next` address
 * (lib/http/page.ts), so a long list never silently stops. A new first page from the server
 * (after router.refresh) starts it over.
 */
import { useState } from "react";
import { fetchApiPage, type ListPage } from "./fetcher";

export function usePagedList<T>(first: ListPage<T>) {
  const [state, setState] = useState({ first, more: [] as T[], next: first.next });
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const current = state.first === first ? state : { first, more: [] as T[], next: first.next };
  if (current !== state) setState(current);

  async function showNext() {
    if (!current.next) return;
    setBusy(true);
    setError(null);
    try {
      const page = await fetchApiPage<T>(current.next);
      setState((s) => (s.first === first ? { first, more: [...s.more, ...page.data], next: page.next } : s));
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(false);
    }
  }
  return { rows: [...first.data, ...current.more], next: current.next, busy, error, showNext };
}
