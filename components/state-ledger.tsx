// BATCH_STATES lists the states in the flow from arrival to decision, then the side states
import { BATCH_STATES, type BatchState } from "@/db/schema";
import { batchStateLabel, formatCount } from "@/lib/format";

/** Fill of each state in the ledger bar; the word beside each count carries the meaning too. */
export const STATE_FILL: Record<BatchState, string> = {
  received: "var(--t-state-received)",
  checking: "var(--t-state-checking)",
  ready: "var(--t-slate)",
  accepted: "var(--t-reed)",
  bounced: "var(--t-clay)",
  superseded: "var(--t-state-superseded)",
  unreadable: "var(--t-ochre)",
};

/**
 * Batches by state as one bar (widths ∝ counts, in the order a batch moves) with the
 * counts written out beneath it — a small picture of the intake flow.
 */
export function StateLedger({ counts, label }: { counts: Record<BatchState, number>; label: string }) {
  const total = BATCH_STATES.reduce((a, s) => a + (counts[s] ?? 0), 0);
  return (
    <figure className="max-w-4xl" aria-label={label}>
      {total > 0 ? (
        <div className="flex h-3 w-full overflow-hidden rounded-sm bg-sand-deep" aria-hidden="true">
          {BATCH_STATES.filter((s) => counts[s] > 0).map((s) => (
            <div
              key={s}
              title={`${batchStateLabel(s)}: ${counts[s]}`}
              style={{ width: `${(100 * counts[s]) / total}%`, background: STATE_FILL[s] }}
              className="h-full border-r border-white last:border-r-0"
            />
          ))}
        </div>
      ) : (
        <div className="h-3 w-full rounded-sm bg-sand-deep" aria-hidden="true" title="No batches yet" />
      )}
      <dl className="mt-2 flex flex-wrap gap-x-5 gap-y-1 text-sm">
        {BATCH_STATES.map((s) => (
          <div key={s} className="flex items-center gap-1.5" data-state={s}>
            <span
              aria-hidden="true"
              className="inline-block h-2.5 w-2.5 rounded-[2px]"
              style={{ background: STATE_FILL[s] }}
            />
            <dt className="text-ink-soft">{batchStateLabel(s)}</dt>
            <dd className={`tabular font-semibold ${counts[s] ? "text-ink" : "text-silt-ink"}`}>
              {formatCount(counts[s] ?? 0)}
            </dd>
          </div>
        ))}
        <div className="flex items-center gap-1.5 border-l border-silt-line pl-5">
          <dt className="text-ink-soft">All batches</dt>
          <dd className="tabular font-semibold">{formatCount(total)}</dd>
        </div>
      </dl>
    </figure>
  );
}
