import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader, Section, EmptyState } from "@/components/ui";
import { requireUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/permissions";
import { formatCount } from "@/lib/format";
import { listPoolStudiesForUser, loadPool } from "@/lib/pool";

export const metadata = { title: "Pools" };

export default async function PoolsPage() {
  const user = await requireUser();
  if (!can(user.role, "pool.read")) notFound();
  const studies = (await listPoolStudiesForUser(user)).filter((s) => s.currentPlanVersion != null);
  const pools = await Promise.all(studies.map((s) => loadPool(s)));
  return (
    <>
      <PageHeader
        eyebrow="Pools"
        title="Accepted data by study"
        description="Each study's accepted batch versions combined, and whether they can carry the planned model yet."
      />
      <Section title="Studies" id="pools">
        {pools.length === 0 ? (
          <EmptyState title="No studies">You are not assigned to any study yet.</EmptyState>
        ) : (
          <div className="table-frame">
            <table className="w-full max-w-4xl text-sm tabular-nums" data-testid="pools-table">
              <thead>
                <tr className="border-b border-silt-line text-left">
                  <th className="py-1 pr-4">Study</th>
                  <th className="py-1 pr-4 text-right">Accepted versions</th>
                  <th className="py-1 pr-4 text-right">Complete cases</th>
                  <th className="py-1 pr-4 text-right">Residual df</th>
                  <th className="py-1 pr-4 text-right">Target</th>
                  <th className="py-1 pr-4 text-right">Headroom</th>
                </tr>
              </thead>
              <tbody>
                {pools.map((p) => {
                  const h = p.report.model.residualDf - p.report.model.dfTarget;
                  return (
                    <tr key={p.slug} className="border-b border-silt-line/50">
                      <td className="py-1 pr-4">
                        <Link className="text-channel underline" href={`/pool/${p.slug}`}>
                          {p.title}
                        </Link>
                      </td>
                      <td className="py-1 pr-4 text-right">{p.members.length}</td>
                      <td className="py-1 pr-4 text-right">{formatCount(p.report.rows.complete)}</td>
                      <td className="py-1 pr-4 text-right">{formatCount(p.report.model.residualDf)}</td>
                      <td className="py-1 pr-4 text-right">{formatCount(p.report.model.dfTarget)}</td>
                      <td className={`py-1 pr-4 text-right ${h >= 0 ? "text-reed-ink" : "text-ochre-ink"}`}>
                        {h >= 0 ? `+${formatCount(h)}` : `${formatCount(-h)} short`}
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
      </Section>
    </>
  );
}
