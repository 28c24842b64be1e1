import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { QueueView } from "@/components/triage/queue-view";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { pageQueueForUser, QUEUE_LIST } from "@/lib/batches/queries-queue";
import { nextHref, PAGE_SIZE } from "@/lib/http/page";

export const metadata = { title: "Review queue" };

export default async function QueuePage() {
  const user = await requireUser();
  if (!can(user.role, "batch.decide")) notFound();
  const page = await pageQueueForUser(user, { limit: PAGE_SIZE });
  const initial = {
    data: page.rows.map((i) => ({
      ...i,
      uploadedAt: i.uploadedAt.toISOString(),
      since: i.since.toISOString(),
    })),
    // the following pages come from the API, as the refreshes do
    next: nextHref("/api/v1/queue", new URLSearchParams(), QUEUE_LIST, page),
  };
  return (
    <>
      <PageHeader
        eyebrow="Analyst"
        title="Review queue"
        description="The newest version of every batch in your studies that waits for a decision, oldest first. It refreshes by itself."
      />
      <QueueView initial={initial} pageSize={PAGE_SIZE} />
    </>
  );
}
