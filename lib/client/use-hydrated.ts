"use client";

import { useSyncExternalStore } from "react";

const subscribe = () => () => {};

/**
 * False during the server render and the first (hydrating) client render, true after.
 * Forms whose submit is handled in JavaScript keep their button disabled until then, so a
 * fast click cannot fall through to a plain browser submit (which would put the fields,
 * a password included, into the address bar).
 */
export function useHydrated(): boolean {
  return useSyncExternalStore(
    subscribe,
    () => true,
    () => false,
  );
}
