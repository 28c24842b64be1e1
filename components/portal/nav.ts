import type { UserRole } from "@/db/schema";
import { can, type Action } from "@/lib/auth/permissions";

/** Where each role starts. */
export const ROLE_HOME: Record<UserRole, string> = {
  provider: "/provider",
  analyst: "/analyst",
  lead: "/lead",
  admin: "/admin",
};

type NavItem = {
  href: string;
  label: string;
  action?: Action;
  roles?: readonly UserRole[];
  demoOnly?: boolean;
};

// Pages that exist; each later page adds itself here with the action that opens it.
const NAV: readonly NavItem[] = [
  { href: "/studies", label: "Studies", action: "study.read" },
  { href: "/upload", label: "Upload", action: "batch.upload", roles: ["provider"] },
  { href: "/queue", label: "Review queue", action: "batch.decide" },
  { href: "/board", label: "Board", action: "board.read" },
  { href: "/pool", label: "Pools", action: "pool.read" },
  { href: "/admin/users", label: "Users", action: "user.manage" },
  { href: "/admin/jobs", label: "Checks", action: "user.manage" },
  { href: "/invite", label: "Invite", action: "user.invite", roles: ["lead"] },
  { href: "/mailbox", label: "Mailbox", action: "mailbox.read", demoOnly: true },
];

/** The top-bar links a role may follow (read from the permissions table). */
export function navFor(role: UserRole, opts: { mailbox?: boolean } = {}): { href: string; label: string }[] {
  const home = { href: ROLE_HOME[role], label: "Home" };
  const rest = NAV.filter(
    (n) =>
      (!n.action || can(role, n.action)) &&
      (!n.roles || n.roles.includes(role)) &&
      (!n.demoOnly || opts.mailbox),
  );
  return [
    home,
    ...rest.map(({ href, label }) => ({ href, label })),
    { href: "/settings", label: "Settings" },
  ];
}
