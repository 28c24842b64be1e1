import Link from "next/link";
import { getHomeSummary } from "@/lib/batches/queries-home";
import { PageHeader } from "@/components/ui/page-header";
import { Section } from "@/components/ui/section";
import { EmptyState } from "@/components/ui/empty-state";
import { KeyFigures } from "@/components/key-figures";
import { StudyTable } from "@/components/home/study-table";
import { BatchTable } from "@/components/home/batch-table";
import { requireRole, toBatchRows, toStudyRow } from "../home-helpers";

export const metadata = { title: "Home" };

export default async function AnalystHome() {
  const user = await requireRole("analyst");
  const home = await getHomeSummary(user);
  if (home.role !== "analyst") throw new Error("home summary for the wrong role");
  const sum = (k: "accepted" | "bounced") => home.studies.reduce((a, s) => a + s.batchesByState[k], 0);
  return (
    <>
      <PageHeader
        eyebrow="Analyst"
        title="Review desk"
        description="Batches waiting for your decision in the studies you are assigned to."
      />
      <KeyFigures
        items={[
          { id: "ready", label: "Awaiting review", value: home.readyForReview },
          { id: "studies", label: "Assigned studies", value: home.studies.length },
          { id: "accepted", label: "Accepted", value: sum("accepted") },
          { id: "bounced", label: "Bounced", value: sum("bounced") },
        ]}
      />
      <Section
        id="queue"
        title="Awaiting review"
        note={
          home.readyForReview > home.queue.length ? (
            <>
              The {home.queue.length} most recently uploaded of {home.readyForReview} waiting.{" "}
              <Link href="/queue" className="text-channel-deep underline underline-offset-2">
                The review queue
              </Link>{" "}
              lists every one, oldest first.
            </>
          ) : (
            "Oldest first is usually fairest: sort by “State since”."
          )
        }
      >
        <BatchTable
          caption="Batches awaiting review"
          rows={toBatchRows(home.queue)}
          showProvider
          emptyTitle="Nothing waits for review"
          emptyText="When a provider's batch has been checked, it appears here for your decision."
        />
      </Section>
      <Section id="studies" title="Assigned studies">
        {home.studies.length ? (
          <StudyTable variant="analyst" caption="Assigned studies" rows={home.studies.map(toStudyRow)} />
        ) : (
          <EmptyState title="No studies assigned">
            A study lead or an administrator assigns analysts to studies.
          </EmptyState>
        )}
      </Section>
    </>
  );
}
