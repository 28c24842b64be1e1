/**
 * Browser Web Worker: runs the readiness engine on the file a provider has chosen,
 * before it is uploaded, so obvious faults show at once and the page stays responsive.
 */
import { checkBatch, parsePlan } from "@/lib/readiness";

export type PrecheckRequest = { file: File; plan: unknown };
export type PrecheckMessage =
  | { type: "progress"; rows: number; bytes: number; total: number }
  | { type: "done"; report: Omit<Awaited<ReturnType<typeof checkBatch>>, "state"> }
  | { type: "error"; message: string };

const post = (m: PrecheckMessage) => (self as unknown as Worker).postMessage(m);

self.onmessage = async (event: MessageEvent<PrecheckRequest>) => {
  const { file, plan } = event.data;
  const parsed = parsePlan(plan);
  if (!parsed.ok) {
    post({
      type: "error",
      message: "The study's data plan could not be read; the server will still check the file.",
    });
    return;
  }
  try {
    let last = 0;
    const report = await checkBatch(file.stream(), parsed.plan, {
      fileName: file.name,
      onProgress: ({ rows, bytes }) => {
        const now = Date.now();
        if (now - last < 150) return;
        last = now;
        post({ type: "progress", rows, bytes, total: file.size });
      },
    });
    const { state: _state, ...rest } = report;
    post({ type: "done", report: rest });
  } catch (e) {
    post({ type: "error", message: e instanceof Error ? e.message : "The check in the browser stopped." });
  }
};
