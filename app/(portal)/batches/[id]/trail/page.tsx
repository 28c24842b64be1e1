import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { TrailTable } from "@/components/triage/trail-table";
import { requireUser } from "@/lib/auth/session";
import { getBatchTrailForUser } from "@/lib/batches/queries-trail";

export const metadata = { title: "Audit trail" };

export default async function TrailPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser();
  const { id } = await params;
  const trail = await getBatchTrailForUser(user, id);
  if (!trail) notFound();
  return (
    <>
      <PageHeader
        eyebrow={`${trail.batch.studyTitle} · ${trail.batch.organisationName}`}
        title={`Audit trail: ${trail.batch.title}`}
        description={
          <>
            Every version, check, decision and e-mail of this batch, oldest first.{" "}
            <Link href={`/batches/${trail.batch.publicId}`} className="text-channel underline">
              Back to the batch
            </Link>
          </>
        }
      />
      <TrailTable
        entries={trail.entries.map((e) => ({ ...e, at: e.at.toISOString() }))}
        csvName={`${trail.batch.publicId}-audit-trail`}
      />
    </>
  );
}
