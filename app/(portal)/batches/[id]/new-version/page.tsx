import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { UploadPanel } from "@/components/intake/upload-panel";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { getBatchForUser } from "@/lib/batches/queries";
import { listUploadTargets } from "@/lib/batches/queries-upload-targets";
import { env } from "@/lib/env";

export const metadata = { title: "New version" };

export default async function NewVersionPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser();
  if (!can(user.role, "batch.upload")) notFound();
  const { id } = await params;
  const batch = await getBatchForUser(user, id);
  if (!batch) notFound();
  const target = (await listUploadTargets(user)).find((t) => t.slug === batch.studySlug);
  if (!target) notFound();
  return (
    <>
      <PageHeader
        eyebrow={batch.studyTitle}
        title={`New version of ${batch.title}`}
        description="Upload the corrected file. It is checked against the study's current data plan, and the report shows which findings are resolved."
      />
      <UploadPanel
        studies={[{ slug: target.slug, title: target.title, plan: target.plan }]}
        maxUploadMb={env().MAX_UPLOAD_MB}
        batch={{ publicId: batch.publicId, title: batch.title, studySlug: batch.studySlug }}
      />
    </>
  );
}
