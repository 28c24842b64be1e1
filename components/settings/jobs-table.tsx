"use client";
import { LocalTime } from "@/components/ui/local-time";
import Link from "next/link";
import { useTransition } from "react";
import { useRouter } from "next/navigation";
import { toast } from "sonner";
import { DataTable, type Column } from "@/components/data-table";
import { Button } from "@/components/ui/button";
import type { Result } from "@/lib/result";

type Job = {
  id: number;
  status: string;
  attempts: number;
  lockedBy: string | null;
  lastError: string | null;
  createdAt: string;
  batchId: string;
  batchTitle: string;
  version: number;
  studyTitle: string;
  organisationName: string;
};

export function JobsTable({ jobs, retry }: { jobs: Job[]; retry: (id: number) => Promise<Result<null>> }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const columns: Column<Job>[] = [
    {
      key: "batch",
      header: "Batch",
      width: "minmax(12rem, 2fr)",
      value: (j) => j.batchTitle,
      render: (j) => (
        <Link className="text-channel underline" href={`/batches/${j.batchId}?v=${j.version}`}>
          {j.batchTitle} v{j.version}
        </Link>
      ),
    },
    { key: "org", header: "Provider", value: (j) => j.organisationName },
    { key: "status", header: "Check", width: "7rem", value: (j) => j.status },
    { key: "attempts", header: "Attempts", numeric: true, width: "6rem", value: (j) => j.attempts },
    { key: "error", header: "Last error", width: "minmax(14rem, 3fr)", value: (j) => j.lastError ?? "" },
    {
      key: "created",
      header: "Queued",
      width: "11rem",
      value: (j) => j.createdAt,
      render: (j) => <LocalTime value={j.createdAt} />,
    },
    {
      key: "retry",
      header: "",
      width: "6rem",
      sortable: false,
      value: () => "",
      render: (j) =>
        j.status === "failed" ? (
          <Button
            size="sm"
            variant="secondary"
            busy={pending}
            onClick={() =>
              start(async () => {
                const r = await retry(j.id);
                if (r.ok) toast.success("Queued again.");
                else toast.error(r.message);
                router.refresh();
              })
            }
          >
            Retry
          </Button>
        ) : null,
    },
  ];
  return (
    <DataTable
      rows={jobs}
      columns={columns}
      caption="Checks not done"
      csvName="checks-not-done"
      empty={<p className="text-base text-silt-ink">Every check has finished.</p>}
    />
  );
}
