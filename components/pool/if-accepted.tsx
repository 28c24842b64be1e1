/**
 * "If accepted" for a version ready for review: the study's pool as it stands beside the pool
 * with this version added, the df ledger of the pool after, and the drift of this version
 * against the pool. A server component the batch page streams in (behind Suspense, with
 * IfAcceptedPending meanwhile) for a version awaiting review, when the viewer may see the pool.
 */
import Link from "next/link";
import { Section } from "@/components/ui";
import { DfLedger, ledgerOf } from "@/components/report/df-ledger";
import { FindingsTable } from "@/components/report/report-tables";
import type { SessionUser } from "@/lib/auth/session";
import { getIfAcceptedForUser } from "@/lib/pool/queries";
import { IfAcceptedQuestions } from "./if-accepted-questions";
import { PoolFigures } from "./pool-figures";

/** What stands in the panel's place while the pool with this version is merged (streamed after the page). */
export function IfAcceptedPending() {
  return (
    <Section title="If accepted" id="if-accepted">
      <p className="text-sm text-silt-ink" role="status">
        Merging this version into the study&apos;s pool…
      </p>
    </Section>
  );
}

export async function IfAcceptedPanel({
  batchPublicId,
  version,
  user,
}: {
  batchPublicId: string;
  version: number;
  user: SessionUser;
}) {
  const r = await getIfAcceptedForUser(user, batchPublicId, version);
  if (!r)
    // the page streams this in for a version awaiting review: say why nothing is shown rather
    // than leave the section index pointing nowhere
    return (
      <Section title="If accepted" id="if-accepted">
        <p className="text-sm text-silt-ink">
          Not available for this version: it is no longer awaiting review, or no engine state of it is stored
          under the study&apos;s current plan.
        </p>
      </Section>
    );
  const crosses =
    r.before.model.residualDf < r.before.model.dfTarget && r.after.model.residualDf >= r.after.model.dfTarget;
  return (
    <Section
      title="If accepted"
      id="if-accepted"
      note={
        <>
          The pool of{" "}
          <Link className="text-channel underline" href={`/pool/${r.studySlug}`}>
            this study
          </Link>{" "}
          ({r.poolMembers} accepted {r.poolMembers === 1 ? "version" : "versions"}) as it stands and with
          version {r.version} added, merged from the stored engine states.
          {crosses ? " Accepting it brings the pool to its df target." : ""}
        </>
      }
    >
      <div className="grid grid-cols-1 gap-4" data-testid="if-accepted">
        <PoolFigures
          caption="Pool figures now and if this version is accepted"
          columns={[
            { heading: "Pool now", report: r.before },
            { heading: "With this version", report: r.after },
          ]}
        />
        {r.after.status === "checked" && r.after.rows.total > 0 ? (
          <DfLedger data={ledgerOf(r.after)} label="Pool with this version" />
        ) : null}
        <IfAcceptedQuestions user={user} batchPublicId={batchPublicId} version={version} />
        <div>
          <h3 className="mb-1 text-md font-semibold">Drift against the pool</h3>
          {r.poolMembers === 0 ? (
            <p className="text-sm text-silt-ink">The pool is empty: there is nothing to compare with yet.</p>
          ) : r.drift.length === 0 ? (
            <p className="text-sm text-silt-ink">
              No drift: no new levels, no standardized mean difference of 0.25 or more, no missingness moved
              by more than 10 points.
            </p>
          ) : (
            <FindingsTable
              findings={r.drift.map((f, i) => ({ ...f, id: `drift-${i}` }))}
              caption="Drift against the pool"
              csvName={`${batchPublicId}-v${version}-drift`}
            />
          )}
        </div>
      </div>
    </Section>
  );
}

export default IfAcceptedPanel;
