/**
 * Browser Web Worker: the fix proposals of a stored batch version and the corrected file, made
 * by the same engine code the server and the CLI run (lib/readiness fixes), off the page's thread.
 * The file is streamed, never held whole: one pass for the proposals (whose tally answers the
 * provider's sentinel confirmations), one more to write the corrected file into a Blob.
 */
import {
  parsePlan,
  type ConfirmedSentinel,
  type FixChange,
  type FixProposal,
  type FixTally,
  type ReadinessReport,
} from "@/lib/readiness";
import { correctedBlob, tallyStream } from "./fix-stream";

export type FixesRequest =
  | { type: "propose"; url: string; plan: unknown; report: ReadinessReport }
  | { type: "confirm"; sentinels: ConfirmedSentinel[] }
  | { type: "apply"; ids: string[] };
export type FixesMessage =
  | { type: "proposals"; proposals: FixProposal[] }
  | { type: "applied"; blob: Blob; changes: FixChange[] }
  | { type: "error"; message: string };

const post = (m: FixesMessage) => (self as unknown as Worker).postMessage(m);

let source: { url: string; report: ReadinessReport; tally: FixTally } | null = null;
let proposals: FixProposal[] = [];

async function open(url: string): Promise<ReadableStream<Uint8Array> | string> {
  const res = await fetch(url, { credentials: "same-origin" });
  if (!res.ok || !res.body)
    return `The version's file could not be fetched (HTTP ${res.status}). Reload the page and try again.`;
  return res.body;
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
      const body = await open(m.url);
      if (typeof body === "string") return post({ type: "error", message: body });
      const tally = await tallyStream(body, plan.plan, m.report);
      source = { url: m.url, report: m.report, tally };
      proposals = tally.proposals(m.report);
      post({ type: "proposals", proposals });
    } else if (!source) {
      post({ type: "error", message: "Find the fixes first." });
    } else if (m.type === "confirm") {
      proposals = source.tally.proposals(source.report, { confirmedSentinels: m.sentinels });
      post({ type: "proposals", proposals });
    } else {
      const body = await open(source.url);
      if (typeof body === "string") return post({ type: "error", message: body });
      const chosen = proposals.filter((p) => m.ids.includes(p.id));
      const out = await correctedBlob(body, chosen, {
        delimiter: source.report.file?.delimiter || undefined,
      });
      post({ type: "applied", blob: out.blob, changes: out.changes });
    }
  } catch (e) {
    post({ type: "error", message: e instanceof Error ? e.message : "Making the fixes stopped." });
  }
};
