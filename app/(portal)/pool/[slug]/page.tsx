import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader, Section } from "@/components/ui";
import { DfLedger, ledgerOf } from "@/components/report/df-ledger";
import { ColumnsTable, FindingsTable, LevelBars } from "@/components/report/report-tables";
import { FitSummary } from "@/components/report/fit-summary";
import { MissingnessMap } from "@/components/report/report-pictures";
import { CollinearityPanel } from "@/components/report/collinearity-panel";
import { MembersTable } from "@/components/pool/members-table";
import { PoolFigures } from "@/components/pool/pool-figures";
import { PoolQuestionsSections } from "@/components/pool/pool-questions";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { formatCount, formatNumber } from "@/lib/format";
import { getPoolForUser } from "@/lib/pool/queries";
import { getPoolQuestionsForUser } from "@/lib/pool/questions-access";
import { thresholdsOf } from "@/lib/readiness";

export const metadata = { title: "Pool" };

export default async function PoolPage({ params }: { params: Promise<{ slug: string }> }) {
  const user = await requireUser();
  if (!can(user.role, "pool.read")) notFound();
  const { slug } = await params;
  const pool = await getPoolForUser(user, slug);
  if (!pool) notFound();
  const questions = await getPoolQuestionsForUser(user, slug);
  const r = pool.report;
  const t = thresholdsOf(pool.plan);
  const headroom = r.model.residualDf - r.model.dfTarget;
  const factors = r.columns.filter((c) => c.levels && (c.role === "predictor" || c.role === "response"));
  const planned = r.columns.filter((c) => c.role === "response" || c.role === "predictor").map((c) => c.name);
  const coll = r.collinearity;
  const api = `/api/v1/pool/${pool.slug}`;
  return (
    <>
      <PageHeader
        eyebrow={
          <Link href="/pool" className="underline">
            Pools
          </Link>
        }
        title={`Pool of ${pool.title}`}
        description={`The ${pool.members.length} accepted ${pool.members.length === 1 ? "version" : "versions"} of this study combined under data plan version ${pool.planVersion}, merged from the engine states stored with each version — no file is read again.`}
        actions={
          <>
            <a
              className="rounded border border-channel px-3 py-1.5 text-sm text-channel hover:bg-shallows"
              href={`${api}/rows`}
              download
              data-testid="export-rows"
            >
              Rows CSV
            </a>
            <a
              className="rounded border border-channel px-3 py-1.5 text-sm text-channel hover:bg-shallows"
              href={`${api}/dictionary?format=csv`}
              download
            >
              Data dictionary CSV
            </a>
            <a
              className="rounded border border-channel px-3 py-1.5 text-sm text-channel hover:bg-shallows"
              href={`${api}/dictionary`}
            >
              JSON
            </a>
          </>
        }
      />
      <div
        className={`mb-6 rounded border-l-4 px-4 py-3 ${headroom >= 0 ? "border-reed bg-reed-wash text-reed-ink" : "border-ochre bg-ochre-wash text-ochre-ink"}`}
        data-testid="pool-verdict"
      >
        <p className="text-md font-semibold">
          {r.rows.total === 0
            ? "The pool is empty: no batch has been accepted yet."
            : headroom >= 0
              ? `The pool can carry the model: ${formatCount(r.model.residualDf)} residual df, ${formatCount(headroom)} beyond the target of ${formatCount(r.model.dfTarget)}.`
              : `Not there yet: ${formatCount(r.model.residualDf)} residual df, ${formatCount(-headroom)} short of the target of ${formatCount(r.model.dfTarget)}.`}
        </p>
        <p className="mt-1 text-sm tabular-nums">
          n = {formatCount(r.rows.complete)} complete of {formatCount(r.rows.total)} rows · p ={" "}
          {r.model.parameters} · {formatNumber(r.model.perParameter, "estimate")} complete cases per parameter
          (plan asks {t.perParameter})
        </p>
      </div>

      <Section
        title="Degrees of freedom"
        id="ledger"
        note="The pool's complete cases split into the intercept, the model's parameters and the residual df, against the plan's target."
      >
        <DfLedger data={ledgerOf(r, pool.plan.intercept)} label="The pool" />
      </Section>

      <Section title="Figures" id="figures">
        <PoolFigures caption="The pool's figures" columns={[{ heading: "Pool", report: r }]} />
      </Section>

      <Section title="Accepted versions" id="members">
        <MembersTable
          csvName={`${pool.slug}-pool-versions`}
          rows={pool.members.map((m) => ({
            id: String(m.batchVersionId),
            organisationName: m.organisationName,
            batchPublicId: m.batchPublicId,
            batchTitle: m.batchTitle,
            version: m.version,
            fileName: m.fileName,
            rowsTotal: m.rowsTotal,
            rowsComplete: m.rowsComplete,
            residualDf: m.residualDf,
            decidedAt: m.decidedAt ? m.decidedAt.toISOString() : null,
            currentPlan: m.currentPlan,
          }))}
        />
      </Section>

      {questions ? <PoolQuestionsSections view={questions.view} slug={pool.slug} /> : null}

      {r.rows.total > 0 ? (
        <>
          <Section
            title="Findings on the pool"
            id="findings"
            note="Model-level checks on the pooled data; row-level findings belong to each batch's own report."
          >
            <FindingsTable
              findings={r.findings.map((f, i) => ({ ...f, id: String(i) }))}
              caption="Findings on the pool"
              csvName={`${pool.slug}-pool-findings`}
            />
          </Section>

          <Section
            title="Levels across the pool"
            id="levels"
            note={`Levels with fewer than ${t.sparseLevel} complete cases are marked sparse.`}
          >
            <div className="grid grid-cols-1 gap-6 md:grid-cols-2">
              {factors.map((c) => (
                <div key={c.name}>
                  <h3 className="mb-1 font-mono text-sm">{c.name}</h3>
                  <LevelBars levels={c.levels ?? []} sparse={t.sparseLevel} />
                </div>
              ))}
            </div>
          </Section>

          <Section title="Columns" id="columns">
            <ColumnsTable columns={r.columns} findings={r.findings} csvName={`${pool.slug}-pool-columns`} />
          </Section>

          <Section
            title="Collinearity"
            id="collinearity"
            note="On the pool's complete cases. VIF for one-column terms; GVIF^(1/(2·df)) for terms with several columns (Fox & Monette 1992)."
          >
            {coll ? (
              <CollinearityPanel coll={coll} thresholds={t} csvName={`${pool.slug}-pool-collinearity`} />
            ) : (
              <p className="text-sm text-silt-ink">
                Not computed: too few complete rows for the planned design.
              </p>
            )}
          </Section>

          <Section title="Missingness" id="missingness">
            <MissingnessMap
              patterns={r.missingness.patterns}
              overflow={r.missingness.patternsOverflow}
              columns={planned}
              total={r.rows.total}
            />
          </Section>

          <Section
            title="Fit preview"
            id="fit"
            note="Least squares on the pool's complete cases — a sanity check before the modelling, not the analysis."
          >
            {r.fit ? (
              <FitSummary fit={r.fit} csvName={`${pool.slug}-pool-coefficients`} />
            ) : (
              <p className="text-sm text-silt-ink">
                No fit: the pool has no residual degrees of freedom yet.
              </p>
            )}
          </Section>
        </>
      ) : null}
    </>
  );
}
