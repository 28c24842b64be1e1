/**
 * The demo's season: about twelve weeks of invented intake, as a list of moments — uploads,
 * decisions and one republished plan — that lib/demo/season-run.ts plays through the real
 * services with the clock set to each moment. Week 0 starts on the Monday eleven weeks
 * before the current one, so the board's twelve weeks are filled whatever day it is run.
 */
import { weekStart } from "@/lib/pool/board-stats";
import { seasonCsv, type Defect } from "./season-files";

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

/** What happens to one version: its file's defect, then accepted, bounced or left waiting. */
type Step = {
  defect: Defect;
  outcome: "accept" | "bounce" | "wait";
  afterHours?: number;
  resubmitHours?: number;
};
type Spec = {
  org: string;
  code: string;
  study: "barley-nitrogen" | "heat-pump-savings";
  label: string;
  /** first upload: week (0–10), weekday (0 = Monday) and hour, or hours before now */
  at: [week: number, day: number, hour: number] | { hoursAgo: number };
  rows: number;
  steps: Step[];
};

const acc = (defect: Defect, afterHours: number, resubmitHours?: number): Step => ({
  defect,
  outcome: "accept",
  afterHours,
  resubmitHours,
});
const bounce = (defect: Defect, afterHours: number, resubmitHours: number): Step => ({
  defect,
  outcome: "bounce",
  afterHours,
  resubmitHours,
});
const wait = (defect: Defect): Step => ({ defect, outcome: "wait" });

const B = "barley-nitrogen" as const;
const H = "heat-pump-savings" as const;

/* prettier-ignore */
const SPECS: Spec[] = [
  // Harrowgate: steady and clean
  { org: "harrowgate", code: "HG", study: B, label: "plots, early drilling", at: [0, 1, 9], rows: 48, steps: [acc("clean", 20)] },
  { org: "harrowgate", code: "HG", study: B, label: "plots, north block", at: [3, 2, 14], rows: 52, steps: [acc("clean", 6)] },
  { org: "harrowgate", code: "HG", study: B, label: "plots, river field", at: [6, 1, 10], rows: 46, steps: [acc("clean", 30)] },
  { org: "harrowgate", code: "HG", study: B, label: "plots, top field", at: [9, 3, 11], rows: 50, steps: [acc("clean", 4)] },
  { org: "harrowgate", code: "HG", study: B, label: "plots, late drilling", at: { hoursAgo: 7 }, rows: 44, steps: [wait("clean")] },
  // Fennick Hill: spelling of levels, and a computed water column
  { org: "fennick-hill", code: "FH", study: B, label: "plots, first cut", at: [1, 2, 16], rows: 50, steps: [bounce("variants", 28, 50), acc("clean", 8)] },
  { org: "fennick-hill", code: "FH", study: B, label: "plots, trial strip", at: [5, 4, 9], rows: 54, steps: [bounce("collinear", 50, 70), acc("clean", 20)] },
  { org: "fennick-hill", code: "FH", study: B, label: "plots, east block", at: [9, 1, 15], rows: 48, steps: [bounce("variants", 22, 30), bounce("variants", 6, 48), acc("clean", 5)] },
  // Brackenridge: a gap in irrigation once
  { org: "brackenridge", code: "BR", study: B, label: "plots, spring", at: [2, 0, 11], rows: 52, steps: [bounce("missing", 40, 96), acc("clean", 30)] },
  { org: "brackenridge", code: "BR", study: B, label: "plots, summer", at: [7, 3, 8], rows: 50, steps: [acc("clean", 26)] },
  // Hollinsfold: small, late
  { org: "hollinsfold", code: "HF", study: B, label: "plots, home farm", at: [4, 4, 17], rows: 14, steps: [bounce("few", 72, 120), acc("clean", 10)] },
  { org: "hollinsfold", code: "HF", study: B, label: "plots, out-farm", at: { hoursAgo: 30 }, rows: 46, steps: [wait("clean")] },
  // Saltmarsh End: semicolons and decimal commas, -999 for "not counted"
  { org: "saltmarsh-end", code: "SE", study: B, label: "plots, coastal", at: [1, 3, 10], rows: 48, steps: [bounce("sentinel", 45, 60), acc("commas", 18)] },
  { org: "saltmarsh-end", code: "SE", study: B, label: "plots, marsh edge", at: [6, 2, 13], rows: 46, steps: [acc("commas", 52)] },
  { org: "saltmarsh-end", code: "SE", study: B, label: "plots, sea wall", at: [9, 4, 12], rows: 44, steps: [bounce("variants", 48, 0)] },
  // Coldwell: clean, quick
  { org: "coldwell", code: "CW", study: B, label: "plots, valley", at: [0, 3, 12], rows: 56, steps: [acc("clean", 9)] },
  { org: "coldwell", code: "CW", study: B, label: "plots, hill", at: [4, 1, 9], rows: 52, steps: [acc("clean", 14)] },
  { org: "coldwell", code: "CW", study: B, label: "plots, long meadow", at: [8, 2, 10], rows: 50, steps: [acc("clean", 3)] },
  { org: "coldwell", code: "CW", study: B, label: "plots, stackyard", at: { hoursAgo: 5 }, rows: 48, steps: [wait("clean")] },
  { org: "coldwell", code: "CW", study: B, label: "plots, barn field", at: { hoursAgo: 52 }, rows: 46, steps: [acc("clean", 30)] },
  // Wrenfold: sends late in the season
  { org: "wrenfold", code: "WF", study: B, label: "plots, first season", at: [5, 5, 19], rows: 50, steps: [acc("clean", 60)] },
  { org: "wrenfold", code: "WF", study: B, label: "plots, second block", at: [10, 3, 16], rows: 48, steps: [bounce("missing", 20, 0)] },
  // Cowslip Ley
  { org: "cowslip-ley", code: "CL", study: B, label: "plots, ley field", at: [2, 4, 15], rows: 50, steps: [bounce("missing", 64, 40), acc("clean", 12)] },
  { org: "cowslip-ley", code: "CL", study: B, label: "plots, orchard side", at: [8, 0, 9], rows: 14, steps: [bounce("few", 8, 150), acc("clean", 26)] },
  // Tallowbeck: joins late, keeps sending -999
  { org: "tallowbeck", code: "TB", study: B, label: "plots, beck side", at: [7, 1, 11], rows: 48, steps: [bounce("sentinel", 30, 80), bounce("sentinel", 12, 0)] },

  // Greenhearth: the steady installer
  { org: "greenhearth", code: "GH", study: H, label: "retrofits, batch 1", at: [0, 2, 10], rows: 48, steps: [acc("clean", 5)] },
  { org: "greenhearth", code: "GH", study: H, label: "retrofits, batch 2", at: [2, 1, 9], rows: 44, steps: [acc("clean", 12)] },
  { org: "greenhearth", code: "GH", study: H, label: "retrofits, batch 3", at: [4, 3, 14], rows: 46, steps: [bounce("missing", 26, 30), acc("clean", 4)] },
  { org: "greenhearth", code: "GH", study: H, label: "retrofits, batch 4", at: [6, 0, 11], rows: 50, steps: [acc("clean", 8)] },
  { org: "greenhearth", code: "GH", study: H, label: "retrofits, batch 5", at: [8, 4, 10], rows: 44, steps: [acc("clean", 70)] },
  { org: "greenhearth", code: "GH", study: H, label: "retrofits, batch 6", at: [10, 2, 9], rows: 48, steps: [acc("clean", 6)] },
  { org: "greenhearth", code: "GH", study: H, label: "retrofits, batch 7", at: { hoursAgo: 40 }, rows: 44, steps: [acc("clean", 22)] },
  { org: "greenhearth", code: "GH", study: H, label: "retrofits, batch 8", at: { hoursAgo: 26 }, rows: 46, steps: [wait("clean")] },
  // Tarnbrook: floor areas in square feet, twice
  { org: "tarnbrook-heating", code: "TH", study: H, label: "members' homes, spring", at: [1, 1, 13], rows: 46, steps: [bounce("range", 50, 100), bounce("range", 30, 60), acc("clean", 20)] },
  { org: "tarnbrook-heating", code: "TH", study: H, label: "members' homes, early summer", at: [5, 2, 10], rows: 12, steps: [bounce("few", 9, 120), acc("clean", 30)] },
  { org: "tarnbrook-heating", code: "TH", study: H, label: "members' homes, summer", at: [9, 3, 9], rows: 48, steps: [acc("clean", 44)] },
  { org: "tarnbrook-heating", code: "TH", study: H, label: "members' homes, autumn", at: [10, 1, 15], rows: 44, steps: [acc("clean", 24)] },
  // Emberlane
  { org: "emberlane", code: "EL", study: H, label: "installs, first quarter", at: [3, 3, 12], rows: 46, steps: [acc("clean", 16)] },
  { org: "emberlane", code: "EL", study: H, label: "installs, second quarter", at: [7, 2, 10], rows: 48, steps: [bounce("missing", 22, 48), acc("clean", 7)] },
  { org: "emberlane", code: "EL", study: H, label: "installs, third quarter", at: { hoursAgo: 20 }, rows: 46, steps: [wait("clean")] },
  // Kestrel Row: late, slow to resubmit
  { org: "kestrel-row", code: "KR", study: H, label: "homes, pilot", at: [6, 4, 16], rows: 44, steps: [bounce("range", 70, 170), acc("clean", 30)] },
  { org: "kestrel-row", code: "KR", study: H, label: "homes, scheme", at: { hoursAgo: 3 }, rows: 46, steps: [wait("missing")] },
];

export type SeasonVersion = {
  kind: "upload";
  at: Date;
  org: string;
  study: string;
  title: string;
  version: number;
  fileName: string;
  csv: string;
  defect: Defect;
};
export type SeasonDecision = {
  kind: "decide";
  at: Date;
  org: string;
  study: string;
  title: string;
  version: number;
  decision: "accept" | "bounce";
  defect: Defect;
};
export type SeasonPlanChange = { kind: "plan"; at: Date; study: string };
export type SeasonEvent = SeasonVersion | SeasonDecision | SeasonPlanChange;

/** The season's moments in time order, relative to `today` (never later than it). */
export function seasonEvents(today: Date): SeasonEvent[] {
  const start = new Date(weekStart(today).getTime() - 11 * 7 * DAY);
  const latest = today.getTime() - 10 * 60_000;
  const clamp = (t: number) => new Date(Math.min(t, latest));
  const events: SeasonEvent[] = [
    { kind: "plan", at: new Date(start.getTime() + 5 * 7 * DAY + 9.5 * HOUR), study: B },
  ];
  SPECS.forEach((s, i) => {
    const title = `${s.code} ${s.label}`;
    let t = Array.isArray(s.at)
      ? start.getTime() + (s.at[0] * 7 + s.at[1]) * DAY + s.at[2] * HOUR
      : today.getTime() - s.at.hoursAgo * HOUR;
    // version `version` of the batch, uploaded at t; its rows grow by two per version
    const upload = (version: number, seedOffset: number, defect: Defect) =>
      events.push({
        kind: "upload",
        at: clamp(t),
        org: s.org,
        study: s.study,
        title,
        version,
        fileName: `${s.org}-${s.label.replace(/[^a-z0-9]+/gi, "-").toLowerCase()}-v${version}.csv`,
        csv: seasonCsv(
          s.study,
          `${s.code}${i}`,
          s.rows + 2 * (version - 1),
          9000 + i * 31 + seedOffset,
          defect,
        ),
        defect,
      });
    s.steps.forEach((step, v) => {
      const version = v + 1;
      upload(version, v, step.defect);
      if (step.outcome === "wait") return;
      const decidedAt = t + (step.afterHours ?? 4) * HOUR;
      events.push({
        kind: "decide",
        at: clamp(decidedAt),
        org: s.org,
        study: s.study,
        title,
        version,
        decision: step.outcome,
        defect: step.defect,
      });
      // a resubmission of 0 hours: the next version is today's, a few hours ago
      t = step.resubmitHours ? decidedAt + step.resubmitHours * HOUR : today.getTime() - (2 + (i % 9)) * HOUR;
      if (t <= decidedAt) t = decidedAt + HOUR;
    });
    // a bounce as the last step: the provider's fix is waiting in today's queue
    const last = s.steps[s.steps.length - 1];
    if (last?.outcome === "bounce") upload(s.steps.length + 1, s.steps.length + 1, "clean");
  });
  // uploads of one batch keep their order when clamped to the same moment
  return events
    .map((e, i) => ({ e, i }))
    .sort((a, b) => a.e.at.getTime() - b.e.at.getTime() || a.i - b.i)
    .map(({ e }) => e);
}
