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
