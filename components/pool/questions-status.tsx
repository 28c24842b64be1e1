/** When the stored pool questions were computed, for what, and whether newer ones are on their way. */
import { LocalTime } from "@/components/ui/local-time";
import type { QuestionsView } from "@/lib/pool/questions";
import { RefreshWhilePending } from "./refresh-while-pending";

export function QuestionsStatus({ view, what = "these figures" }: { view: QuestionsView; what?: string }) {
  const s = view.stored;
  const pending = view.recomputing ? <RefreshWhilePending /> : null;
  if (!s) {
    return (
      <p className="text-sm text-silt-ink" data-testid="questions-status" role="status">
        {pending}
        {view.recomputing
          ? `Being computed: the worker is working out ${what} from the stored engine states; this page refreshes when they are stored.`
          : `Not computed yet: the worker computes ${what} when a version is accepted, a version is ready for review or the plan is published.`}
      </p>
    );
  }
  const n = s.versionIds.length;
  return (
    <p className="text-sm text-silt-ink" data-testid="questions-status" role="status">
      {pending}
      Computed <LocalTime value={s.computedAt} /> by the worker under data plan version {s.planVersion}, over{" "}
      {n} accepted {n === 1 ? "version" : "versions"}.
      {view.recomputing ? (
        <strong className="ml-1 font-semibold text-ochre-ink" data-testid="recomputing">
          Being recomputed: the pool has changed; the figures below are the previous ones until the new ones
          are stored.
        </strong>
      ) : view.outOfDate ? (
        <strong className="ml-1 font-semibold text-ochre-ink">
          Out of date: the pool has changed since and no computation is queued; the worker queues one when it
          next starts.
        </strong>
      ) : null}
    </p>
  );
}
