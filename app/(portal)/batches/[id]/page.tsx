import Link from "next/link";
import { notFound } from "next/navigation";
import { Suspense } from "react";
import { PageHeader } from "@/components/ui/page-header";
import { Section } from "@/components/ui/section";
import { StateBadge } from "@/components/state-badge";
import { CheckProgress } from "@/components/report/check-progress";
import { DecisionForm } from "@/components/triage/decision-form";
import { IfAcceptedPanel, IfAcceptedPending } from "@/components/pool/if-accepted";
import { decideAction } from "./actions";
import { ReportView, findingKey, verdictOf } from "@/components/report/report-view";
import { SummaryBar, type SectionLink } from "@/components/triage/summary-bar";
import { ReviewProvider } from "@/components/triage/review-context";
import { NextInQueue } from "@/components/triage/next-in-queue";
import { PendingNotes } from "@/components/triage/pending-notes";
import { getNextInQueueForUser } from "@/lib/batches/queries-next";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { getBatchForUser } from "@/lib/batches/queries";
import { getVersionReportForUser } from "@/lib/batches/queries-reports";
import { getVersionFixForUser } from "@/lib/batches/queries-fixes";
import { FixPanel } from "@/components/fixes/fix-panel";
import { MachineCorrected } from "@/components/fixes/machine-corrected";
import { LocalTime } from "@/components/ui/local-time";
import { formatBytes } from "@/lib/format";

export const metadata = { title: "Batch" };

export default async function BatchPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ v?: string }>;
}) {
  const user = await requireUser();
  const { id } = await params;
  const { v } = await searchParams;
  const batchInfo = await getBatchForUser(user, id);
  if (!batchInfo) notFound();
  const wanted = v && /^\d+$/.test(v) ? Number(v) : batchInfo.latestVersion;
  const found = await getVersionReportForUser(user, id, wanted, batchInfo);
  if (!found) notFound();
  const { batch, version, report } = found;

  // what the page needs beside the report, read at once: the previous version's report (to
  // compare finding by finding), a machine correction, and after a decision the next in queue
  const [prev, fix, next] = await Promise.all([
    report && version.version > 1
      ? getVersionReportForUser(user, id, version.version - 1, batchInfo)
      : Promise.resolve(null),
    getVersionFixForUser(user, id, version.version, batchInfo),
    can(user.role, "batch.decide") && found.decision
      ? getNextInQueueForUser(user, batch.publicId)
      : Promise.resolve(null),
  ]);
  let previous: {
    resolved: NonNullable<typeof report>["findings"];
    status: Map<string, "remains" | "new">;
  } | null = null;
  if (report && prev?.report) {
    const before = new Set(prev.report.findings.map(findingKey));
    const now = new Set(report.findings.map(findingKey));
    previous = {
      resolved: prev.report.findings.filter((f) => !now.has(findingKey(f))),
      status: new Map(
        report.findings.map((f) => [findingKey(f), before.has(findingKey(f)) ? "remains" : "new"]),
      ),
    };
  }
  const isProvider = user.role === "provider" && can(user.role, "batch.upload");
  const canDecide =
    can(user.role, "batch.decide") &&
    version.version === batch.latestVersion &&
    (version.state === "ready" || version.state === "unreadable");
  const canResubmit = isProvider && version.version === batch.latestVersion && batch.state !== "accepted";
  const reviewing = canDecide && !!report && !found.decision;
  // "If accepted" merges this version into the study's pool: the slowest part of the page, so it
  // streams in after the rest (a version awaiting review, for those who may see the pool)
  const ifAccepted = can(user.role, "pool.read") && version.state === "ready";
  const sections = sectionsOf({
    since: !!previous,
    decision: !!found.decision,
    report,
    ifAccepted,
  });

  const page = (
    <div className="[&_h2]:scroll-mt-32">
      <PageHeader
        eyebrow={`${batch.studyTitle} · ${batch.organisationName}`}
        title={batch.title}
        description={
          <>
            Version {version.version} of {batch.latestVersion}:{" "}
            <span className="font-mono text-sm">{version.fileName}</span> ({formatBytes(version.fileSize)}),
            uploaded <LocalTime value={version.uploadedAt} />
            {version.uploadedByName ? ` by ${version.uploadedByName}` : ""}, checked against data plan version{" "}
            {found.plan.version}.
          </>
        }
        actions={
          <>
            <StateBadge state={version.state} />
            <Link href={`/batches/${batch.publicId}/trail`} className="text-sm text-channel underline">
              Audit trail
            </Link>
            <a
              href={`/api/v1/batches/${batch.publicId}/versions/${version.version}/file`}
              className="text-sm text-channel underline"
              download
              data-testid="original-file"
            >
              Original file
            </a>
            {report?.status === "checked" && report.findings.some((f) => f.rows.length > 0) ? (
              <a
                href={`/api/v1/batches/${batch.publicId}/versions/${version.version}/rows-at-fault`}
                className="text-sm text-channel underline"
                download
                data-testid="rows-at-fault"
              >
                Download rows at fault (CSV)
              </a>
            ) : null}
            {canResubmit ? (
              <Link
                href={`/batches/${batch.publicId}/new-version`}
                className="rounded border border-channel bg-channel px-3 py-1.5 text-sm font-semibold text-white hover:bg-channel-deep"
              >
                Upload a new version
              </Link>
            ) : null}
          </>
        }
      />

      {batch.versions.length > 1 ? (
        <nav aria-label="Versions" className="mb-6 flex flex-wrap gap-2 text-sm">
          {batch.versions.map((bv) => (
            <Link
              key={bv.version}
              href={`/batches/${batch.publicId}?v=${bv.version}`}
              aria-current={bv.version === version.version ? "page" : undefined}
              className={`rounded border px-2 py-1 ${bv.version === version.version ? "border-channel bg-shallows font-semibold" : "border-silt-line bg-white hover:bg-channel-wash"}`}
            >
              v{bv.version} · {bv.state === "ready" ? "awaiting review" : bv.state}
            </Link>
          ))}
        </nav>
      ) : null}

      <SummaryBar
        report={report}
        verdict={report ? verdictOf(report) : null}
        sections={sections}
        controls={
          reviewing ? (
            <DecisionForm
              batchId={batch.publicId}
              version={version.version}
              findings={report.findings}
              canAccept={version.state === "ready"}
              decide={decideAction}
            />
          ) : can(user.role, "batch.decide") && found.decision ? (
            <NextInQueue next={next} />
          ) : null
        }
      />

      <CheckProgress batchId={batch.publicId} version={version.version} state={version.state} />
      <PendingNotes notes={found.notes} />

      {previous ? (
        <Section
          title={`Since version ${version.version - 1}`}
          id="since"
          note="Findings are matched by code and columns."
        >
          <p className="text-sm tabular-nums" data-testid="since-previous">
            {previous.resolved.length} resolved ·{" "}
            {[...previous.status.values()].filter((s) => s === "remains").length} remain ·{" "}
            {[...previous.status.values()].filter((s) => s === "new").length} new
          </p>
          {previous.resolved.length ? (
            <ul className="mt-2 grid gap-1 text-sm">
              {previous.resolved.map((f, i) => (
                <li key={i} className="text-reed-ink">
                  ✓ Resolved: <code className="text-xs">{f.code}</code>{" "}
                  {f.columns.length ? (
                    <span className="font-mono text-xs">({f.columns.join(", ")})</span>
                  ) : null}{" "}
                  — {f.message}
                </li>
              ))}
            </ul>
          ) : null}
        </Section>
      ) : null}

      {found.decision ? (
        <Section title={found.decision.decision === "accept" ? "Accepted" : "Bounced"} id="decision">
          <div
            className={`rounded border-l-4 px-4 py-3 ${found.decision.decision === "accept" ? "border-reed bg-reed-wash" : "border-clay bg-clay-wash"}`}
            data-testid="decision"
          >
            <p className="text-sm">
              {found.decision.decision === "accept" ? "Accepted" : "Bounced"} by {found.decision.decidedBy} on{" "}
              <LocalTime value={found.decision.decidedAt} />.
            </p>
            {found.decision.comment ? (
              <p className="mt-2 whitespace-pre-wrap text-base">{found.decision.comment}</p>
            ) : null}
            {found.decision.findingComments.length ? (
              <ul className="mt-2 grid gap-1 text-sm">
                {found.decision.findingComments.map((c, i) => (
                  <li key={i}>
                    <code className="text-xs">{c.code}</code>
                    {c.columns.length ? (
                      <span className="font-mono text-xs"> ({c.columns.join(", ")})</span>
                    ) : null}
                    : {c.comment}
                  </li>
                ))}
              </ul>
            ) : null}
          </div>
        </Section>
      ) : null}

      {fix ? (
        <MachineCorrected
          batchId={batch.publicId}
          version={version.version}
          fix={fix}
          preview={fix.preview}
        />
      ) : null}

      {canResubmit && report?.status === "checked" ? (
        <FixPanel
          batchId={batch.publicId}
          studySlug={batch.studySlug}
          version={version.version}
          fileName={version.fileName}
          plan={found.plan.plan}
          report={{ ...report, state: undefined }}
        />
      ) : null}

      {report ? (
        <ReportView
          report={report}
          plan={found.plan.plan}
          csvPrefix={`${batch.publicId}-v${version.version}`}
          findingStatus={previous?.status}
        />
      ) : version.state === "received" || version.state === "checking" ? null : (
        <p className="text-base">No readiness report is stored for this version.</p>
      )}

      {ifAccepted ? (
        <Suspense fallback={<IfAcceptedPending />}>
          <IfAcceptedPanel batchPublicId={batch.publicId} version={version.version} user={user} />
        </Suspense>
      ) : null}
    </div>
  );
  return reviewing ? <ReviewProvider>{page}</ReviewProvider> : page;
}

/** The index of the page's sections, in the order they appear. */
function sectionsOf(has: {
  since: boolean;
  decision: boolean;
  report: { status: string } | null;
  ifAccepted: boolean;
}): SectionLink[] {
  const checked = has.report?.status === "checked";
  const all: [boolean, string, string][] = [
    [has.since, "since", "Since last version"],
    [has.decision, "decision", "Decision"],
    [checked, "ledger", "Degrees of freedom"],
    [!!has.report, "findings", "Findings"],
    [checked, "columns", "Columns"],
    [checked, "collinearity", "Collinearity"],
    [checked, "missingness", "Missingness"],
    [checked, "fit", "Fit preview"],
    [has.ifAccepted, "if-accepted", "If accepted"],
  ];
  return all.filter(([on]) => on).map(([, id, title]) => ({ id, title }));
}
