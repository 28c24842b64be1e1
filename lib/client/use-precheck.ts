"use client";
/** Runs the readiness engine on a chosen file in a Web Worker, with progress. */
import { useCallback, useEffect, useRef, useState } from "react";
import type { PrecheckMessage } from "./precheck.worker";

export type PrecheckState =
  | { phase: "idle" }
  | { phase: "running"; rows: number; bytes: number; total: number }
  | { phase: "done"; report: Extract<PrecheckMessage, { type: "done" }>["report"] }
  | { phase: "error"; message: string };

export function usePrecheck() {
  const [state, setState] = useState<PrecheckState>({ phase: "idle" });
  const worker = useRef<Worker | null>(null);

  const stop = useCallback(() => {
    worker.current?.terminate();
    worker.current = null;
  }, []);

  useEffect(() => stop, [stop]);

  const run = useCallback(
    (file: File, plan: unknown) => {
      stop();
      const w = new Worker(new URL("./precheck.worker.ts", import.meta.url), { type: "module" });
      worker.current = w;
      setState({ phase: "running", rows: 0, bytes: 0, total: file.size });
      w.onmessage = (e: MessageEvent<PrecheckMessage>) => {
        const m = e.data;
        if (m.type === "progress")
          setState({ phase: "running", rows: m.rows, bytes: m.bytes, total: m.total });
        else if (m.type === "done") {
          setState({ phase: "done", report: m.report });
          stop();
        } else {
          setState({ phase: "error", message: m.message });
          stop();
        }
      };
      w.onerror = () => {
        setState({
          phase: "error",
          message:
            "The check in the browser could not run; the server will still check the file after upload.",
        });
        stop();
      };
      w.postMessage({ file, plan });
    },
    [stop],
  );

  const reset = useCallback(() => {
    stop();
    setState({ phase: "idle" });
  }, [stop]);

  return { state, run, reset };
}
