"use client";
/** Runs draftPlan on a chosen sample file in a Web Worker; falls back to the page's thread if workers cannot start. */
import { useCallback, useEffect, useRef, useState } from "react";
import type { DraftResult } from "@/lib/readiness";
import type { DraftMessage } from "./draft.worker";

export type DraftState =
  | { phase: "idle" }
  | { phase: "running"; fileName: string; size: number }
  | { phase: "done"; fileName: string; result: DraftResult }
  | { phase: "error"; fileName: string; message: string };

export function useDraft() {
  const [state, setState] = useState<DraftState>({ phase: "idle" });
  const worker = useRef<Worker | null>(null);
  const stop = useCallback(() => {
    worker.current?.terminate();
    worker.current = null;
  }, []);
  useEffect(() => stop, [stop]);

  const inPage = useCallback(async (file: File) => {
    const { draftPlan } = await import("@/lib/readiness");
    try {
      setState({ phase: "done", fileName: file.name, result: await draftPlan(file.stream()) });
    } catch (e) {
      setState({
        phase: "error",
        fileName: file.name,
        message: e instanceof Error ? e.message : "The sample could not be read.",
      });
    }
  }, []);

  const run = useCallback(
    (file: File) => {
      stop();
      setState({ phase: "running", fileName: file.name, size: file.size });
      let w: Worker;
      try {
        w = new Worker(new URL("./draft.worker.ts", import.meta.url), { type: "module" });
      } catch {
        void inPage(file);
        return;
      }
      worker.current = w;
      w.onmessage = (e: MessageEvent<DraftMessage>) => {
        const m = e.data;
        setState(
          m.type === "done"
            ? { phase: "done", fileName: file.name, result: m.result }
            : { phase: "error", fileName: file.name, message: m.message },
        );
        stop();
      };
      w.onerror = () => {
        stop();
        void inPage(file);
      };
      w.postMessage({ file });
    },
    [stop, inPage],
  );

  return { state, run, reset: useCallback(() => setState({ phase: "idle" }), []) };
}
