import { Badge, type BadgeTone } from "@/components/ui/badge";
import { batchStateLabel } from "@/lib/format";

const tones: Record<string, BadgeTone> = {
  received: "neutral",
  checking: "channel",
  ready: "slate",
  accepted: "reed",
  bounced: "clay",
  superseded: "neutral",
  unreadable: "ochre",
};

/** A batch state as a word on a tinted label ("Awaiting review", "Bounced", …). */
export function StateBadge({ state }: { state: string }) {
  return <Badge tone={tones[state] ?? "neutral"}>{batchStateLabel(state)}</Badge>;
}
