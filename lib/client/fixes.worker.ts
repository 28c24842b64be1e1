/**
 * Browser Web Worker: the fix proposals of a stored batch version and the corrected file, made
 * by the same engine code the server and the CLI run (lib/readiness fixes), off the page's thread.
 * The version's file is fetched once and kept here between the two steps.
 */
import {
  applyFixesToBytes,
  parsePlan,
  proposeFixes,
  type FixChange,
  type FixProposal,
  type ReadinessReport,
} from "@/lib/readiness";

export type FixesRequest =
  { type: "propose"; url: string; plan: unknown; report: ReadinessReport } | { type: "apply"; ids: string[] };
export type FixesMessage =
  | { type: "proposals"; proposals: FixProposal[] }
  | { type: "applied"; bytes: Uint8Array; changes: FixChange[] }
  | { type: "error"; message: string };

const post = (m: FixesMessage, transfer: Transferable[] = []) =>
  (self as unknown as Worker).postMessage(m, transfer);

let bytes: Uint8Array | null = null;
let proposals: FixProposal[] = [];
let delimiter: string | undefined;

async function* once(b: Uint8Array): AsyncGenerator<Uint8Array> {
  yield b;
}

self.onmessage = async (event: MessageEvent<FixesRequest>) => {
  const m = event.data;
  try {
    if (m.type === "propose") {
      const plan = parsePlan(m.plan);
      if (!plan.ok)
        return post({
          type: "error",
          message: "The data plan of this version could not be read, so no fixes can be proposed.",
        });
      const res = await fetch(m.url, { credentials: "same-origin" });
      if (!res.ok)
        return post({
          type: "error",
          message: `The version's file could not be fetched (HTTP ${res.status}). Reload the page and try again.`,
        });
      bytes = new Uint8Array(await res.arrayBuffer());
      delimiter = m.report.file?.delimiter || undefined;
      proposals = await proposeFixes(once(bytes), plan.plan, m.report);
      post({ type: "proposals", proposals });
    } else {
      if (!bytes) return post({ type: "error", message: "Find the fixes first." });
      const chosen = proposals.filter((p) => m.ids.includes(p.id));
      const out = await applyFixesToBytes(bytes, chosen, { delimiter });
      post({ type: "applied", bytes: out.bytes, changes: out.changes }, [out.bytes.buffer]);
    }
  } catch (e) {
    post({ type: "error", message: e instanceof Error ? e.message : "Making the fixes stopped." });
  }
};
