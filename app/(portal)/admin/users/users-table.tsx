"use client";

import { LocalTime } from "@/components/ui/local-time";
import { useState, useTransition } from "react";
import { toast } from "sonner";
import { DataTable, type Column } from "@/components/data-table";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Select } from "@/components/ui/select";
import { ROLES, type UserRole } from "@/db/schema";
import { roleLabel } from "@/lib/format";
import { ShowNext } from "@/components/ui/show-next";
import type { ListPage } from "@/lib/client/fetcher";
import { usePagedList } from "@/lib/client/use-paged-list";
import { changeRoleAction, setActiveAction } from "./actions";

export type UserRow = {
  id: number;
  name: string;
  email: string;
  role: UserRole;
  organisationName: string | null;
  active: boolean;
  /** ISO 8601, as the server page and the API both send it */
  createdAt: string;
};

function RoleCell({ row, self }: { row: UserRow; self: boolean }) {
  const [pending, start] = useTransition();
  const [value, setValue] = useState<UserRole>(row.role);
  // a provider belongs to a provider organisation, the other roles to a team: no swapping across
  const options = row.role === "provider" ? (["provider"] as const) : ROLES.filter((r) => r !== "provider");
  const locked = self || row.role === "provider";
  return (
    <Select
      aria-label={`Role of ${row.email}`}
      value={value}
      disabled={pending || locked}
      title={
        self
          ? "You cannot change your own role"
          : row.role === "provider"
            ? "A provider account stays a provider; create a team account instead"
            : undefined
      }
      className="h-7 w-full py-0 text-sm"
      onChange={(e) => {
        const next = e.target.value as UserRole;
        const before = value;
        setValue(next);
        start(async () => {
          const res = await changeRoleAction(row.id, next);
          if (res.ok) toast.success(`${row.name} is now ${roleLabel(next).toLowerCase()}.`);
          else {
            setValue(before);
            toast.error(res.message);
          }
        });
      }}
    >
      {options.map((r) => (
        <option key={r} value={r}>
          {roleLabel(r)}
        </option>
      ))}
    </Select>
  );
}

function ActiveCell({ row, self }: { row: UserRow; self: boolean }) {
  const [pending, start] = useTransition();
  const label = row.active ? "Deactivate" : "Reactivate";
  return (
    <Button
      size="sm"
      variant={row.active ? "danger" : "secondary"}
      busy={pending}
      disabled={self}
      title={self ? "You cannot deactivate your own account" : undefined}
      aria-label={`${label} ${row.email}`}
      onClick={() =>
        start(async () => {
          const res = await setActiveAction(row.id, !row.active);
          if (res.ok)
            toast.success(
              row.active
                ? `${row.name} is deactivated and can no longer sign in.`
                : `${row.name} can sign in again.`,
            );
          else toast.error(res.message);
        })
      }
    >
      {label}
    </Button>
  );
}

export function UsersTable({
  first,
  pageSize,
  currentUserId,
}: {
  first: ListPage<UserRow>;
  pageSize: number;
  currentUserId: number;
}) {
  const { rows, next, busy, error, showNext } = usePagedList(first);
  const columns: Column<UserRow>[] = [
    {
      key: "name",
      header: "Name",
      width: "minmax(10rem, 2fr)",
      value: (r) => r.name,
      render: (r) => <span className="font-semibold">{r.name}</span>,
    },
    { key: "email", header: "E-mail", width: "minmax(13rem, 3fr)", value: (r) => r.email },
    {
      key: "role",
      header: "Role",
      width: "12rem",
      value: (r) => r.role,
      render: (r) => <RoleCell key={`${r.id}-${r.role}`} row={r} self={r.id === currentUserId} />,
    },
    {
      key: "organisation",
      header: "Organisation",
      width: "minmax(11rem, 2fr)",
      value: (r) => r.organisationName,
    },
    {
      key: "active",
      header: "Status",
      width: "8rem",
      value: (r) => (r.active ? "active" : "deactivated"),
      render: (r) => (r.active ? <Badge tone="reed">Active</Badge> : <Badge tone="clay">Deactivated</Badge>),
    },
    {
      key: "created",
      header: "Created",
      width: "8rem",
      value: (r) => r.createdAt,
      render: (r) => <LocalTime value={r.createdAt} dateOnly className="tabular" />,
    },
    {
      key: "actions",
      header: "Access",
      width: "8rem",
      sortable: false,
      csv: false,
      value: () => null,
      render: (r) => <ActiveCell row={r} self={r.id === currentUserId} />,
    },
  ];
  return (
    <div className="grid grid-cols-1 gap-3">
      <DataTable
        rows={rows}
        columns={columns}
        caption="Users"
        csvName="tributary-users"
        filterPlaceholder="Filter by name, e-mail, role…"
      />
      <ShowNext
        shown={rows.length}
        more={next !== null}
        pageSize={pageSize}
        noun="users"
        busy={busy}
        error={error}
        onNext={showNext}
      />
    </div>
  );
}
