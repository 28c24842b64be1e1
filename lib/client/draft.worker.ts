/**
 * Browser Web Worker: drafts a data plan from a sample file with the engine's draftPlan, so a
 * large sample does not freeze the editor.
 */
import { draftPlan, type DraftResult } from "@/lib/readiness";

export type DraftRequest = { file: File; response?: string };
export type DraftMessage = { type: "done"; result: DraftResult } | { type: "error"; message: string };

const post = (m: DraftMessage) => (self as unknown as Worker).postMessage(m);

self.onmessage = async (event: MessageEvent<DraftRequest>) => {
  const { file, response } = event.data;
  try {
    post({ type: "done", result: await draftPlan(file.stream(), response ? { response } : {}) });
  } catch (e) {
    post({ type: "error", message: e instanceof Error ? e.message : "The sample could not be read." });
  }
};
