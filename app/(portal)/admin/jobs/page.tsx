import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { JobsTable } from "@/components/settings/jobs-table";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { listOpenCheckJobs, OPEN_JOBS_SHOWN } from "@/lib/batches/queries-jobs";
import { retryJobAction } from "./actions";

export const metadata = { title: "Checks" };
export const dynamic = "force-dynamic";

export default async function JobsPage() {
  const user = await requireUser();
  if (!can(user.role, "user.manage")) notFound();
  const { jobs, more } = await listOpenCheckJobs(user);
  return (
    <>
      <PageHeader
        eyebrow="Admin"
        title="Checks waiting, running or failed"
        description="A check that failed three times stops here with its error; retry it once the cause (a missing file, the file store down) is fixed."
      />
      {more ? (
        <p className="mb-3 text-sm text-ochre-ink" role="note">
          More than {OPEN_JOBS_SHOWN} checks are open: the {OPEN_JOBS_SHOWN} newest are listed, and the older
          ones come into the list as these finish.
        </p>
      ) : null}
      <JobsTable
        jobs={jobs.map((j) => ({ ...j, createdAt: j.createdAt.toISOString() }))}
        retry={retryJobAction}
      />
    </>
  );
}
