import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { QueueView } from "@/components/triage/queue-view";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { listQueueForUser } from "@/lib/batches/queries-queue";

export const metadata = { title: "Review queue" };

export default async function QueuePage() {
  const user = await requireUser();
  if (!can(user.role, "batch.decide")) notFound();
  const items = await listQueueForUser(user);
  const initial = items.map((i) => ({
    ...i,
    uploadedAt: i.uploadedAt.toISOString(),
    since: i.since.toISOString(),
  }));
  return (
    <>
      <PageHeader
        eyebrow="Analyst"
        title="Review queue"
        description="The newest version of every batch in your studies that waits for a decision, oldest first. It refreshes by itself."
      />
      <QueueView initial={initial} />
    </>
  );
}
