/**
 * The browser's side of the fixes, streamed: the proposals from one pass over the version's file
 * (a tally kept for the provider's sentinel confirmations, so ticking one reads nothing again),
 * and the corrected file written chunk by chunk into a Blob — the page never holds the whole
 * file in its memory (Blob parts are handed to the browser's blob store every HOLD bytes).
 */
import {
  applyFixes,
  tallyFixes,
  type ByteInput,
  type ConfirmedSentinel,
  type FixChange,
  type FixProposal,
  type FixTally,
  type Plan,
  type ReadinessReport,
} from "@/lib/readiness";

/** Bytes of corrected output held in script memory before they go into the Blob. */
export const HOLD = 4 << 20;

/** The values a report suspects of meaning "not measured" (number.sentinel, not declared). */
export function suspectedSentinels(report: ReadinessReport): ConfirmedSentinel[] {
  return report.findings
    .filter((f) => f.code === "number.sentinel" && f.detail?.declared === false && f.columns[0])
    .map((f) => ({ column: f.columns[0]!, value: f.detail!.value as number }))
    .filter((s) => Number.isFinite(s.value));
}

/** One pass over the file: the tally, counting the report's suspected sentinels too. */
export function tallyStream(input: ByteInput, plan: Plan, report: ReadinessReport): Promise<FixTally> {
  return tallyFixes(input, plan, {
    delimiter: report.file?.delimiter || undefined,
    sentinelValues: suspectedSentinels(report),
  });
}

/** The corrected file of `input` as a Blob, written as it streams; `held`: the most bytes script memory held. */
export async function correctedBlob(
  input: ByteInput,
  proposals: FixProposal[],
  opts: { delimiter?: string; type?: string } = {},
): Promise<{ blob: Blob; changes: FixChange[]; held: number }> {
  const type = opts.type ?? "text/csv";
  const { output, changes } = applyFixes(input, proposals, { delimiter: opts.delimiter });
  let blob = new Blob([], { type });
  let parts: Uint8Array[] = [];
  let size = 0;
  let held = 0;
  for await (const c of output) {
    parts.push(c);
    size += c.length;
    held = Math.max(held, size);
    if (size >= HOLD) {
      blob = new Blob([blob, ...(parts as BlobPart[])], { type });
      parts = [];
      size = 0;
    }
  }
  blob = new Blob([blob, ...(parts as BlobPart[])], { type });
  return { blob, changes, held };
}
