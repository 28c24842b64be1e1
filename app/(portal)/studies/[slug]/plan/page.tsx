import Link from "next/link";
import { notFound, redirect } from "next/navigation";
import { PlanEditor } from "@/components/plan-editor/plan-editor";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/auth/permissions";
import { requireUser } from "@/lib/auth/session";
import { getStudyForUser } from "@/lib/studies/queries-detail";
import type { PlanInput } from "@/lib/readiness";
import { listPlanVersionsForUser } from "@/lib/studies/queries";
import { publishPlanAction } from "./actions";

export const metadata = { title: "Data plan editor" };

export default async function PlanEditorPage({
  params,
  searchParams,
}: {
  params: Promise<{ slug: string }>;
  searchParams: Promise<{ created?: string }>;
}) {
  const user = await requireUser();
  const { slug } = await params;
  const { created } = await searchParams;
  const study = await getStudyForUser(user, decodeURIComponent(slug));
  if (!study) notFound();
  if (!can(user.role, "plan.edit")) redirect(`/studies/${study.slug}`);
  const history = await listPlanVersionsForUser(user, study.id);
  const nextVersion = (history[0]?.version ?? 0) + 1;

  return (
    <>
      <PageHeader
        eyebrow={
          <>
            <Link href={`/studies/${study.slug}`}>{study.title}</Link> · data plan
          </>
        }
        title={
          study.currentPlan
            ? `Edit the data plan (current: version ${study.currentPlan.version})`
            : "Write the data plan"
        }
        description={
          created
            ? "The study is created. Draft its plan from a sample file or enter the columns, then publish version 1."
            : "Changes are published as a new version; earlier versions and the batches checked against them stay as they were."
        }
      />
      <PlanEditor
        studySlug={study.slug}
        initialPlan={(study.currentPlan?.plan as PlanInput | undefined) ?? null}
        currentVersion={study.currentPlan?.version ?? null}
        nextVersion={nextVersion}
        publish={publishPlanAction.bind(null, study.slug)}
      />
    </>
  );
}
