/**
 * A machine-corrected version, as everyone who may see it sees it: which version it was made
 * from, the fixes applied, who approved them, and the change log (the first cells here, all of
 * them as CSV).
 */
import { LocalTime } from "@/components/ui/local-time";
import { Section } from "@/components/ui/section";
import type { FixChange } from "@/lib/readiness";

export type MachineCorrectedProps = {
  batchId: string;
  version: number;
  fix: {
    fromVersion: number;
    proposals: { id: string; message: string; cells: number; confirmed?: number[] }[];
    changeCount: number;
    approvedBy: string;
    at: Date;
  };
  preview: FixChange[];
};

export function MachineCorrected({ batchId, version, fix, preview }: MachineCorrectedProps) {
  const shown = (s: string) => (s === "" ? "(empty)" : `“${s}”`);
  return (
    <Section
      title="Machine-corrected version"
      id="machine-corrected"
      note={`Made by Tributary from version ${fix.fromVersion} with fixes the provider chose; version ${fix.fromVersion} and its file are unchanged.`}
    >
      <div
        className="rounded border-l-4 border-channel bg-shallows px-4 py-3"
        data-testid="machine-corrected"
      >
        <p className="text-sm">
          Produced from version {fix.fromVersion} by applying {fix.proposals.map((p) => p.id).join(", ")};{" "}
          {fix.changeCount.toLocaleString("en")} cell
          {fix.changeCount === 1 ? "" : "s"} changed. Approved by {fix.approvedBy} on{" "}
          <LocalTime value={fix.at} />.
        </p>
        <ul className="mt-1 grid gap-0.5 text-sm">
          {fix.proposals.map((p) => (
            <li key={p.id}>
              {p.message} ({p.cells.toLocaleString("en")})
              {p.confirmed?.length
                ? ` — the provider confirmed that ${p.confirmed.join(", ")} means not measured`
                : ""}
            </li>
          ))}
        </ul>
        <a
          href={`/api/v1/batches/${batchId}/versions/${version}/changes`}
          download
          className="mt-2 inline-block text-sm text-channel underline"
          data-testid="change-log"
        >
          Download the change log (CSV)
        </a>
      </div>
      <table className="mt-3 w-full text-sm" data-testid="change-log-table">
        <caption className="sr-only">Changed cells</caption>
        <thead>
          <tr className="text-left">
            <th className="py-1 pr-3">Row</th>
            <th className="py-1 pr-3">Column</th>
            <th className="py-1 pr-3">Before</th>
            <th className="py-1 pr-3">After</th>
          </tr>
        </thead>
        <tbody>
          {preview.map((c, i) => (
            <tr key={i} className="border-t border-silt-line font-mono text-xs">
              <td className="py-1 pr-3 tabular-nums">{c.row}</td>
              <td className="py-1 pr-3">{c.column}</td>
              <td className="py-1 pr-3">{shown(c.before)}</td>
              <td className="py-1 pr-3">{shown(c.after)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {fix.changeCount > preview.length ? (
        <p className="mt-1 text-sm text-silt-ink">
          The first {preview.length} of {fix.changeCount.toLocaleString("en")} changed cells; the CSV has them
          all.
        </p>
      ) : null}
    </Section>
  );
}
