/**
 * The intake flow: versions moving received → checking → ready / unreadable →
 * accepted / bounced / superseded over a period, drawn as bands whose widths are the counts.
 * Every node is labelled with its word and count, so colour is never the only carrier.
 */
import { STATE_FILL } from "@/components/state-ledger";
import type { BatchState } from "@/db/schema";
import { batchStateLabel, formatCount } from "@/lib/format";

type Flow = { from: string; to: string; versions: number }[];

const COLUMNS: BatchState[][] = [
  ["received"],
  ["checking"],
  ["ready", "unreadable"],
  ["accepted", "bounced", "superseded"],
];

export function IntakeFlow({
  flow,
  received,
  sinceLabel,
}: {
  flow: Flow;
  received: number;
  sinceLabel: string;
}) {
  const W = 760;
  const H = 220;
  const nodeW = 12;
  const gap = 14;
  const get = (from: string, to: string) => flow.find((f) => f.from === from && f.to === to)?.versions ?? 0;
  const value: Record<string, number> = {
    received,
    checking: get("received", "checking"),
    ready: get("checking", "ready"),
    unreadable: get("checking", "unreadable"),
    accepted: get("ready", "accepted"),
    bounced: get("ready", "bounced"),
    superseded: get("ready", "superseded"),
  };
  if (received === 0) return <p className="text-sm text-silt-ink">No version arrived in this period.</p>;
  const scale = (H - gap * 2) / Math.max(received, 1);
  const colX = (i: number) => 8 + i * ((W - 140) / (COLUMNS.length - 1));
  const pos: Record<string, { x: number; y: number; h: number; outAt: number; inAt: number }> = {};
  COLUMNS.forEach((states, i) => {
    let y = 4;
    for (const s of states) {
      const h = Math.max(value[s]! * scale, value[s]! > 0 ? 2 : 0);
      pos[s] = { x: colX(i), y, h, outAt: y, inAt: y };
      y += h + (h > 0 ? gap : 0);
    }
  });
  const links: { from: string; to: string; v: number }[] = [
    ["received", "checking"],
    ["checking", "ready"],
    ["checking", "unreadable"],
    ["ready", "accepted"],
    ["ready", "bounced"],
    ["ready", "superseded"],
  ]
    .map(([a, b]) => ({ from: a!, to: b!, v: get(a!, b!) }))
    .filter((l) => l.v > 0);
  const waitingInReady = value.ready! - value.accepted! - value.bounced! - value.superseded!;
  const stillReceived = received - value.checking!;
  const summary = `Since ${sinceLabel}: ${received} versions received, ${value.checking} checked, ${value.ready} awaiting review, ${value.unreadable} unreadable, ${value.accepted} accepted, ${value.bounced} bounced, ${value.superseded} superseded before a decision, ${waitingInReady} still waiting for a decision.`;
  return (
    <figure className="grid grid-cols-1 gap-1" data-testid="intake-flow">
      <svg viewBox={`0 0 ${W} ${H}`} className="w-full max-w-4xl" role="img" aria-label={summary}>
        {links.map((l) => {
          const a = pos[l.from]!;
          const b = pos[l.to]!;
          const w = l.v * scale;
          const x0 = a.x + nodeW;
          const x1 = b.x;
          const y0 = a.outAt;
          const y1 = b.inAt;
          a.outAt += w;
          b.inAt += w;
          const mx = (x0 + x1) / 2;
          const d = `M${x0},${y0} C${mx},${y0} ${mx},${y1} ${x1},${y1} L${x1},${y1 + w} C${mx},${y1 + w} ${mx},${y0 + w} ${x0},${y0 + w} Z`;
          return (
            <path key={`${l.from}-${l.to}`} d={d} fill={STATE_FILL[l.to as BatchState]} opacity={0.35}>
              <title>{`${batchStateLabel(l.from)} → ${batchStateLabel(l.to)}: ${l.v}`}</title>
            </path>
          );
        })}
        {Object.entries(pos).map(([s, p]) =>
          p.h > 0 ? (
            <g key={s}>
              <rect x={p.x} y={p.y} width={nodeW} height={p.h} fill={STATE_FILL[s as BatchState]} />
              <text
                x={p.x + nodeW + 4}
                y={p.y + Math.min(p.h / 2 + 4, p.h + 10)}
                fontSize="11"
                fill="var(--t-ink)"
              >
                {batchStateLabel(s)} {formatCount(value[s])}
              </text>
            </g>
          ) : null,
        )}
      </svg>
      <figcaption className="text-xs text-silt-ink tabular-nums">
        {summary}
        {stillReceived > 0 ? ` ${stillReceived} not yet picked up by the checker.` : ""}
      </figcaption>
    </figure>
  );
}
