"use client";
/**
 * The one SWR fetcher of the app's client hooks: GET a v1 API address and answer its `data`,
 * or throw the API's own message (the problem details' `detail`, RFC 9457) so the hook's `error` says what
 * went wrong.
 */
export async function fetchApiData<T>(url: string): Promise<T> {
  const res = await fetch(url, { headers: { accept: "application/json" } });
  const body = (await res.json().catch(() => null)) as { data?: T; detail?: string } | null;
  if (!res.ok || !body?.data) throw new Error(body?.detail ?? `The server answered ${res.status}.`);
  return body.data;
}

/** One page of a v1 list: its rows and the address of the next page (null on the last). */
export type ListPage<T> = { data: T[]; next: string | null };

/** GET one page of a v1 list (lib/http/page.ts), or throw the API's own message as fetchApiData does. */
export async function fetchApiPage<T>(url: string): Promise<ListPage<T>> {
  const res = await fetch(url, { headers: { accept: "application/json" } });
  const body = (await res.json().catch(() => null)) as (Partial<ListPage<T>> & { detail?: string }) | null;
  if (!res.ok || !Array.isArray(body?.data))
    throw new Error(body?.detail ?? `The server answered ${res.status}.`);
  return { data: body.data, next: body.next ?? null };
}
