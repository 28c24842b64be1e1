import Link from "next/link";
import type { Column } from "@/components/data-table";
import { Badge } from "@/components/ui/badge";

/** What every study list shows of a study. */
export type StudyIdentity = {
  title: string;
  slug: string;
  team: string | null;
  status: "open" | "closed";
  planVersion: number | null;
};

/**
 * The first columns of every study list: the study (its title opens it, its slug below), who runs
 * it, whether it is open, and its data plan version. `narrow` for the homes, where more columns follow.
 */
export function studyColumns<R extends StudyIdentity>(narrow: boolean): Column<R>[] {
  return [
    {
      key: "title",
      header: "Study",
      width: narrow ? "minmax(12rem, 3fr)" : "minmax(15rem, 3fr)",
      value: (r) => r.title,
      render: (r) => (
        <span className="block">
          <Link
            href={`/studies/${r.slug}`}
            className="block font-semibold text-channel underline-offset-2 hover:underline"
          >
            {r.title}
          </Link>
          <span className="block font-mono text-xs text-silt-ink">{r.slug}</span>
        </span>
      ),
    },
    {
      key: "team",
      header: "Run by",
      width: narrow ? "minmax(8rem, 2fr)" : "minmax(10rem, 2fr)",
      value: (r) => r.team,
    },
    {
      key: "status",
      header: "Status",
      width: narrow ? "5.5rem" : "6rem",
      value: (r) => r.status,
      render: (r) => (
        <Badge tone={r.status === "open" ? "channel" : "neutral"}>
          {r.status === "open" ? "Open" : "Closed"}
        </Badge>
      ),
    },
    {
      key: "plan",
      header: "Data plan",
      width: narrow ? "5.5rem" : "6.5rem",
      numeric: true,
      value: (r) => r.planVersion,
      render: (r) =>
        r.planVersion == null ? <span className="text-silt-ink">none yet</span> : `v${r.planVersion}`,
    },
  ];
}
