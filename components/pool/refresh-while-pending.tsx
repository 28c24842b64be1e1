"use client";
/** While the worker computes newer figures, the page asks the server again every few seconds; rendered only then. */
import { useRouter } from "next/navigation";
import { useEffect } from "react";

export function RefreshWhilePending({ everyMs = 3000 }: { everyMs?: number }) {
  const router = useRouter();
  useEffect(() => {
    const t = setInterval(() => router.refresh(), everyMs);
    return () => clearInterval(t);
  }, [router, everyMs]);
  return null;
}
