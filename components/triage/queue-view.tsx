"use client";
/** The analyst's queue: filters by study, organisation, state and severity; how long each has waited. */
import Link from "next/link";
import { useMemo, useState } from "react";
import { DataTable, type Column } from "@/components/data-table";
import { SeverityBadge } from "@/components/severity-badge";
import { StateBadge } from "@/components/state-badge";
import { Select } from "@/components/ui/select";
import { countOf, formatCount, formatHours } from "@/lib/format";
import { ShowNext } from "@/components/ui/show-next";
import type { ListPage } from "@/lib/client/fetcher";
import { useQueue, type QueueRow } from "@/lib/client/use-queue";

type Row = QueueRow & { id: string };

function waited(since: string, now: number): { ms: number; text: string } {
  const ms = Math.max(0, now - new Date(since).getTime());
  const h = ms / 3_600_000;
  const text =
    h < 1
      ? `${Math.max(1, Math.round(ms / 60_000))} min`
      : h < 48
        ? formatHours(h)
        : countOf(Math.round(h / 24), "day");
  return { ms, text };
}

const SEVERITIES = {
  any: "Any severity",
  blocker: "With blockers",
  warning: "Warnings, no blockers",
  clean: "No blockers or warnings",
} as const;

export function QueueView({ initial, pageSize }: { initial: ListPage<QueueRow>; pageSize: number }) {
  const { rows: data, next, error, busy, showNext } = useQueue(initial);
  const [study, setStudy] = useState("");
  const [org, setOrg] = useState("");
  const [state, setState] = useState("ready");
  const [severity, setSeverity] = useState<keyof typeof SEVERITIES>("any");
  const now = Date.now();

  const studies = useMemo(() => [...new Set(data.map((r) => r.studyTitle))].sort(), [data]);
  const orgs = useMemo(() => [...new Set(data.map((r) => r.organisationName))].sort(), [data]);
  const rows: Row[] = useMemo(
    () =>
      data
        .filter(
          (r) =>
            (!study || r.studyTitle === study) &&
            (!org || r.organisationName === org) &&
            (!state || r.state === state),
        )
        .filter((r) => {
          if (severity === "any") return true;
          if (severity === "blocker") return (r.blockers ?? 0) > 0;
          if (severity === "warning") return (r.blockers ?? 0) === 0 && (r.warnings ?? 0) > 0;
          return (r.blockers ?? 0) === 0 && (r.warnings ?? 0) === 0;
        })
        .map((r) => ({ ...r, id: `${r.batchId}-${r.version}` })),
    [data, study, org, state, severity],
  );

  const columns: Column<Row>[] = [
    {
      key: "title",
      header: "Batch",
      width: "minmax(14rem, 2.5fr)",
      value: (r) => r.title,
      render: (r) => (
        <Link
          href={`/batches/${r.batchId}?v=${r.version}`}
          className="font-semibold text-channel underline-offset-2 hover:underline"
        >
          {r.title} <span className="font-normal text-silt-ink">v{r.version}</span>
        </Link>
      ),
    },
    { key: "study", header: "Study", value: (r) => r.studyTitle },
    { key: "org", header: "Provider", value: (r) => r.organisationName },
    {
      key: "state",
      header: "State",
      width: "9rem",
      value: (r) => r.state,
      render: (r) => <StateBadge state={r.state} />,
    },
    {
      key: "findings",
      header: "Findings",
      width: "minmax(12rem, 1.5fr)",
      value: (r) => (r.blockers ?? 0) * 1e6 + (r.warnings ?? 0) * 1e3 + (r.notes ?? 0),
      render: (r) =>
        r.blockers === null ? (
          <span className="text-silt-ink">not checked yet</span>
        ) : (
          <span className="flex flex-wrap gap-1">
            <SeverityBadge severity="blocker" count={r.blockers} />
            <SeverityBadge severity="warning" count={r.warnings ?? 0} />
          </span>
        ),
    },
    {
      key: "df",
      header: "Residual df",
      numeric: true,
      value: (r) => r.residualDf,
      render: (r) => formatCount(r.residualDf),
    },
    {
      key: "waited",
      header: "Waiting",
      numeric: true,
      width: "7rem",
      value: (r) => waited(r.since, now).ms,
      render: (r) => waited(r.since, now).text,
    },
  ];

  return (
    <div className="grid grid-cols-1 gap-4">
      <div className="flex flex-wrap items-end gap-3" role="group" aria-label="Filters">
        <label className="grid grid-cols-1 gap-1 text-sm font-semibold">
          Study
          <Select value={study} onChange={(e) => setStudy(e.target.value)}>
            <option value="">All studies</option>
            {studies.map((s) => (
              <option key={s}>{s}</option>
            ))}
          </Select>
        </label>
        <label className="grid grid-cols-1 gap-1 text-sm font-semibold">
          Provider
          <Select value={org} onChange={(e) => setOrg(e.target.value)}>
            <option value="">All providers</option>
            {orgs.map((o) => (
              <option key={o}>{o}</option>
            ))}
          </Select>
        </label>
        <label className="grid grid-cols-1 gap-1 text-sm font-semibold">
          State
          <Select value={state} onChange={(e) => setState(e.target.value)}>
            <option value="ready">Awaiting review</option>
            <option value="unreadable">Unreadable</option>
            <option value="checking">Checking</option>
            <option value="received">Received</option>
            <option value="">Any of these</option>
          </Select>
        </label>
        <label className="grid grid-cols-1 gap-1 text-sm font-semibold">
          Severity
          <Select value={severity} onChange={(e) => setSeverity(e.target.value as keyof typeof SEVERITIES)}>
            {Object.entries(SEVERITIES).map(([k, v]) => (
              <option key={k} value={k}>
                {v}
              </option>
            ))}
          </Select>
        </label>
      </div>
      {error ? (
        <p className="text-sm text-clay" role="alert">
          The queue could not be refreshed: {error.message} It will be tried again.
        </p>
      ) : null}
      <DataTable
        rows={rows}
        columns={columns}
        caption="Review queue"
        csvName="review-queue"
        filterPlaceholder="Filter batches"
        empty={<p className="text-base text-silt-ink">Nothing waits in these filters.</p>}
      />
      {/* the filters above sort through the batches loaded so far: more may wait beyond them */}
      <ShowNext
        shown={data.length}
        more={next !== null}
        pageSize={pageSize}
        noun="batches"
        busy={busy}
        onNext={showNext}
      />
    </div>
  );
}
