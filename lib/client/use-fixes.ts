"use client";
/** The fix proposals of a stored version and the corrected file, from the fixes Web Worker. */
import { useCallback, useEffect, useRef, useState } from "react";
import type { ConfirmedSentinel, FixChange, FixProposal, ReadinessReport } from "@/lib/readiness";
import type { FixesMessage, FixesRequest } from "./workers/fixes.worker";

export type FixesState =
  | { phase: "idle" }
  | { phase: "finding" }
  | { phase: "ready"; proposals: FixProposal[] }
  | { phase: "error"; message: string };

export function useFixes() {
  const [state, setState] = useState<FixesState>({ phase: "idle" });
  const worker = useRef<Worker | null>(null);
  const waiting = useRef<((m: FixesMessage) => void) | null>(null);

  useEffect(() => () => worker.current?.terminate(), []);

  const ask = useCallback((req: FixesRequest) => {
    if (!worker.current) {
      const w = new Worker(new URL("./workers/fixes.worker.ts", import.meta.url), { type: "module" });
      w.onmessage = (e: MessageEvent<FixesMessage>) => waiting.current?.(e.data);
      w.onerror = () =>
        waiting.current?.({
          type: "error",
          message: "The fixes could not be made in the browser. Reload the page and try again.",
        });
      worker.current = w;
    }
    return new Promise<FixesMessage>((resolve) => {
      waiting.current = resolve;
      worker.current!.postMessage(req);
    });
  }, []);

  const find = useCallback(
    async (url: string, plan: unknown, report: ReadinessReport) => {
      setState({ phase: "finding" });
      const { state: _state, ...slim } = report;
      const m = await ask({ type: "propose", url, plan, report: slim as ReadinessReport });
      if (m.type === "proposals") setState({ phase: "ready", proposals: m.proposals });
      else setState({ phase: "error", message: m.type === "error" ? m.message : "Unexpected answer." });
    },
    [ask],
  );

  /** The proposals again with the sentinels the provider confirmed (nothing is read again). */
  const confirm = useCallback(
    async (sentinels: ConfirmedSentinel[]) => {
      const m = await ask({ type: "confirm", sentinels });
      if (m.type === "proposals") setState({ phase: "ready", proposals: m.proposals });
      else setState({ phase: "error", message: m.type === "error" ? m.message : "Unexpected answer." });
    },
    [ask],
  );

  /** The corrected file (a Blob, streamed in the worker) and change log for the chosen proposal ids. */
  const apply = useCallback(
    async (ids: string[]): Promise<{ blob: Blob; changes: FixChange[] }> => {
      const m = await ask({ type: "apply", ids });
      if (m.type !== "applied") throw new Error(m.type === "error" ? m.message : "Unexpected answer.");
      return { blob: m.blob, changes: m.changes };
    },
    [ask],
  );

  return { state, find, confirm, apply };
}
