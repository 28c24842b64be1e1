import Link from "next/link";
import type { SessionUser } from "@/lib/auth/session";
import { roleLabel } from "@/lib/format";
import { mailboxEnabled } from "@/lib/mail/demo-mailbox";
import { LogoMark } from "@/components/logo";
import { NavLinks } from "./nav-links";
import { navFor, ROLE_HOME } from "./nav";
import { SignOutButton } from "./sign-out-button";

export function TopBar({ user }: { user: SessionUser }) {
  return (
    <header className="border-b border-silt-line bg-white">
      <div className="mx-auto flex h-14 max-w-page items-center gap-6 px-6">
        <Link
          href={ROLE_HOME[user.role]}
          className="flex items-center gap-2 no-underline"
          aria-label="Tributary home"
        >
          <LogoMark size={26} />
          <span className="text-lg font-semibold tracking-tight text-ink">Tributary</span>
        </Link>
        <nav aria-label="Main">
          <NavLinks items={navFor(user.role, { mailbox: mailboxEnabled() })} />
        </nav>
        <div className="ml-auto flex items-center gap-3 text-right">
          <div className="leading-tight" data-testid="signed-in-user">
            <p className="text-sm font-semibold text-ink">{user.name}</p>
            <p className="text-xs text-silt-ink">
              {roleLabel(user.role)}
              {user.organisationName ? ` · ${user.organisationName}` : ""}
            </p>
          </div>
          <SignOutButton />
        </div>
      </div>
    </header>
  );
}
