import Link from "next/link";
import { notFound } from "next/navigation";
import { ModelSummary } from "@/components/plan-editor/model-summary";
import { PlanColumnsTable } from "@/components/plan-editor/plan-columns-table";
import { PlanHistoryTable } from "@/components/plan-editor/plan-history-table";
import { THRESHOLD_LABELS } from "@/components/plan-editor/threshold-labels";
import { Badge } from "@/components/ui/badge";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { Section } from "@/components/ui/section";
import { can } from "@/lib/auth/permissions";
import { requireUser } from "@/lib/auth/session";
import { getStudyForUser } from "@/lib/studies/queries-detail";
import { LocalTime } from "@/components/ui/local-time";
import { DEFAULT_THRESHOLDS, parsePlan, type Plan } from "@/lib/readiness";
import { modelSize } from "@/lib/studies/model-size";
import { listMembershipCandidates, listPlanVersionsForUser } from "@/lib/studies/queries";
import { MembersPanel } from "./members-panel";
import { StudyStatus } from "./study-status";

export const metadata = { title: "Study" };

const linkButton =
  "inline-flex h-9 items-center rounded border border-channel bg-channel px-3.5 font-semibold text-white hover:bg-channel-deep hover:text-white";

function ModelSettings({ plan }: { plan: Plan }) {
  const overridden = Object.entries(plan.thresholds).filter(
    ([k, v]) => v !== undefined && v !== DEFAULT_THRESHOLDS[k as keyof typeof DEFAULT_THRESHOLDS],
  ) as [keyof typeof DEFAULT_THRESHOLDS, number | null][];
  const tokens = plan.missingTokens.map((t) => (t === "" ? "(empty cell)" : t)).join(", ");
  return (
    <dl className="grid max-w-2xl grid-cols-[14rem_1fr] gap-y-1 text-base">
      <dt className="text-silt-ink">Intercept</dt>
      <dd>{plan.intercept ? "yes" : "no"}</dd>
      <dt className="text-silt-ink">Interactions</dt>
      <dd className="font-mono text-sm">
        {plan.interactions.length ? (
          plan.interactions.map(([a, b]) => `${a} × ${b}`).join(", ")
        ) : (
          <span className="font-sans text-silt-ink">none</span>
        )}
      </dd>
      <dt className="text-silt-ink">Anticipated R²</dt>
      <dd className="tabular">{plan.anticipatedR2 ?? <span className="text-silt-ink">not given</span>}</dd>
      <dt className="text-silt-ink">Outcome mean and SD</dt>
      <dd className="tabular">
        {plan.outcome ? (
          `${plan.outcome.mean} ± ${plan.outcome.sd}`
        ) : (
          <span className="text-silt-ink">not given</span>
        )}
      </dd>
      <dt className="text-silt-ink">Planned selection</dt>
      <dd className="tabular">
        {plan.selection ? (
          Array.isArray(plan.selection.candidates) ? (
            `over ${plan.selection.candidates.join(", ")}`
          ) : (
            `over ${plan.selection.candidates} candidate parameters`
          )
        ) : (
          <span className="text-silt-ink">none</span>
        )}
      </dd>
      <dt className="text-silt-ink">File-wide missing tokens</dt>
      <dd className="font-mono text-sm">{tokens || <span className="font-sans text-silt-ink">none</span>}</dd>
      <dt className="text-silt-ink">Thresholds changed</dt>
      <dd>
        {overridden.length === 0 ? (
          <span className="text-silt-ink">none; the defaults apply</span>
        ) : (
          <ul>
            {overridden.map(([k, v]) => (
              <li key={k}>
                {THRESHOLD_LABELS[k] ?? k}:{" "}
                <span className="tabular font-semibold">{v === null ? "default" : v}</span>{" "}
                <span className="text-sm text-silt-ink">
                  (default {DEFAULT_THRESHOLDS[k] ?? "the df floor"})
                </span>
              </li>
            ))}
          </ul>
        )}
      </dd>
    </dl>
  );
}

export default async function StudyPage({ params }: { params: Promise<{ slug: string }> }) {
  const user = await requireUser();
  const { slug } = await params;
  const study = await getStudyForUser(user, decodeURIComponent(slug));
  if (!study) notFound();
  const [history, candidates] = await Promise.all([
    listPlanVersionsForUser(user, study.id),
    listMembershipCandidates(user),
  ]);
  const manage = can(user.role, "study.manage");
  const editPlan = can(user.role, "plan.edit");
  const parsed = study.currentPlan ? parsePlan(study.currentPlan.plan) : null;
  const current = history.find((h) => h.version === study.currentPlanVersion);

  return (
    <>
      <PageHeader
        eyebrow={<>Study{study.teamOrganisationName ? ` · run by ${study.teamOrganisationName}` : ""}</>}
        title={
          <span className="inline-flex flex-wrap items-center gap-3">
            {study.title}
            <Badge tone={study.status === "open" ? "channel" : "neutral"}>
              {study.status === "open" ? "Open" : "Closed"}
            </Badge>
          </span>
        }
        description={study.description ?? undefined}
        actions={
          editPlan ? (
            <Link href={`/studies/${study.slug}/plan`} className={linkButton}>
              {study.currentPlan ? "Edit the data plan" : "Write the data plan"}
            </Link>
          ) : null
        }
      />

      {manage ? (
        <Section id="status" title="Status">
          <StudyStatus
            slug={study.slug}
            title={study.title}
            description={study.description}
            status={study.status}
          />
        </Section>
      ) : null}

      <Section
        id="plan"
        title={study.currentPlan ? `Data plan, version ${study.currentPlan.version}` : "Data plan"}
        note={
          study.currentPlan ? (
            <>
              Current since <LocalTime value={study.currentPlan.createdAt} />
              {current?.createdByName ? `, published by ${current.createdByName}` : ""}. Every batch version
              is checked against the plan version current when it arrived.
            </>
          ) : undefined
        }
      >
        {!study.currentPlan ? (
          <EmptyState
            title="No data plan yet"
            action={
              editPlan ? (
                <Link href={`/studies/${study.slug}/plan`} className={linkButton}>
                  Write the data plan
                </Link>
              ) : null
            }
          >
            Batches cannot be checked until the study has a data plan.
            {editPlan
              ? " Draft one from a sample file or enter the columns by hand."
              : " An admin or lead publishes it."}
          </EmptyState>
        ) : parsed && !parsed.ok ? (
          <p role="alert" className="text-clay">
            The stored plan does not pass the current schema:{" "}
            {parsed.issues.map((i) => `${i.path || "plan"}: ${i.message}`).join("; ")}. Publish a corrected
            version.
          </p>
        ) : parsed?.ok ? (
          <div className="flex flex-col gap-6">
            <PlanColumnsTable columns={parsed.plan.columns} version={study.currentPlan.version} />
            <div className="grid grid-cols-1 gap-8 lg:grid-cols-[minmax(0,1fr)_22rem]">
              <div>
                <h3 className="mb-2 text-md font-semibold">The model</h3>
                <ModelSettings plan={parsed.plan} />
              </div>
              <div>
                <h3 className="mb-2 text-md font-semibold">Model terms and size</h3>
                <ModelSummary size={modelSize(parsed.plan)} />
              </div>
            </div>
          </div>
        ) : null}
      </Section>

      {history.length > 0 ? (
        <Section id="versions" title="Plan versions">
          <PlanHistoryTable
            rows={history.map((h) => ({
              id: h.id,
              version: h.version,
              note: h.note,
              createdAt: h.createdAt.toISOString(),
              createdByName: h.createdByName,
              planHash: h.planHash,
              current: h.version === study.currentPlanVersion,
            }))}
          />
        </Section>
      ) : null}

      <div className="grid grid-cols-1 gap-x-8 lg:grid-cols-2">
        {user.role !== "provider" ? (
          <Section
            id="analysts"
            title={`Analysts (${study.analysts.length})`}
            note="Assigned analysts review this study's batches and see its pool."
          >
            <MembersPanel
              slug={study.slug}
              kind="analyst"
              canManage={manage}
              members={study.analysts.map((a) => ({ id: a.id, name: a.name, detail: a.email }))}
              candidates={candidates.analysts}
            />
          </Section>
        ) : null}
        <Section
          id="providers"
          title={
            user.role === "provider"
              ? "Your organisation"
              : `Provider organisations (${study.providers.length})`
          }
          note={
            user.role === "provider"
              ? undefined
              : "Providers of admitted organisations upload batches to this study."
          }
        >
          <MembersPanel
            slug={study.slug}
            kind="provider"
            canManage={manage}
            members={study.providers.map((p) => ({ id: p.id, name: p.name }))}
            candidates={candidates.providers}
          />
        </Section>
      </div>
    </>
  );
}
