import Link from "next/link";
import { getHomeSummary } from "@/lib/batches/queries-home";
import { PageHeader } from "@/components/ui/page-header";
import { Section } from "@/components/ui/section";
import { KeyFigures } from "@/components/key-figures";
import { ROLES } from "@/db/schema";
import { formatCount, roleLabel } from "@/lib/format";
import { requireRole } from "../home-helpers";

export const metadata = { title: "Administration" };

export default async function AdminHome() {
  const user = await requireRole("admin");
  const home = await getHomeSummary(user);
  if (home.role !== "admin") throw new Error("home summary for the wrong role");
  return (
    <>
      <PageHeader
        eyebrow="Administrator"
        title="Installation"
        description="Who can sign in, in which role, and what this installation holds."
        actions={
          <Link
            href="/admin/users"
            className="rounded border border-channel bg-channel px-3.5 py-2 text-base font-semibold text-white no-underline hover:bg-channel-deep hover:text-white"
          >
            Manage users
          </Link>
        }
      />
      <KeyFigures
        items={[
          { id: "active", label: "Active users", value: home.activeUsers },
          { id: "inactive", label: "Deactivated users", value: home.inactiveUsers },
          { id: "providers", label: "Provider organisations", value: home.organisations.provider },
          { id: "studies", label: "Studies", value: home.studies },
        ]}
      />
      <div className="grid grid-cols-1 gap-8 lg:grid-cols-2">
        <Section id="roles" title="Users by role">
          <table className="w-full max-w-md border-collapse text-sm" aria-labelledby="roles-title">
            <thead>
              <tr className="border-b border-silt text-left">
                <th scope="col" className="py-1.5 pr-4 font-semibold">
                  Role
                </th>
                <th scope="col" className="py-1.5 text-right font-semibold">
                  Users
                </th>
              </tr>
            </thead>
            <tbody>
              {ROLES.map((r) => (
                <tr key={r} className="border-b border-silt-line">
                  <td className="py-1.5 pr-4">{roleLabel(r)}</td>
                  <td className="num py-1.5">{formatCount(home.usersByRole[r])}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Section>
        <Section id="tasks" title="Administration">
          <ul className="space-y-2 text-base">
            <li>
              <Link href="/admin/users" className="font-semibold">
                Users
              </Link>
              <span className="text-ink-soft">
                {" "}
                — create accounts, change roles, deactivate and reactivate.
              </span>
            </li>
            <li className="text-ink-soft">
              Organisations: <span className="tabular">{formatCount(home.organisations.provider)}</span>{" "}
              providers and <span className="tabular">{formatCount(home.organisations.team)}</span> study
              teams.
            </li>
          </ul>
        </Section>
      </div>
    </>
  );
}
