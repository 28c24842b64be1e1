import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { EmptyState } from "@/components/ui/empty-state";
import { UploadPanel } from "@/components/intake/upload-panel";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { listUploadTargets } from "@/lib/batches/queries-upload-targets";
import { env } from "@/lib/env";

export const metadata = { title: "Upload a batch" };

export default async function UploadPage() {
  const user = await requireUser();
  if (!can(user.role, "batch.upload")) notFound();
  const targets = await listUploadTargets(user);
  return (
    <>
      <PageHeader
        eyebrow="New batch"
        title="Upload a batch"
        description="Choose the study and the file. The file is checked in your browser first, then again on the server against the study's data plan."
      />
      {targets.length ? (
        <UploadPanel
          studies={targets.map((t) => ({ slug: t.slug, title: t.title, plan: t.plan }))}
          maxUploadMb={env().MAX_UPLOAD_MB}
        />
      ) : (
        <EmptyState title="No open study takes batches from your organisation">
          A study lead admits your organisation to a study; ask them if you expected one here.
        </EmptyState>
      )}
    </>
  );
}
