import Link from "next/link";
import type { SessionUser } from "@/lib/auth/session";
import { roleLabel } from "@/lib/format";
import { mailboxEnabled } from "@/lib/mail/demo-mailbox";
import { LogoMark } from "@/components/logo";
import { NavLinks } from "./nav-links";
import { navFor, ROLE_HOME } from "./nav";
import { PhoneMenu } from "./phone-menu";
import { SignOutButton } from "./sign-out-button";

/**
 * The top bar: on a wide screen the links and the signed-in user in one row; below 1024 px the
 * links, the user and sign-out fold into a menu behind one button.
 */
export function TopBar({ user }: { user: SessionUser }) {
  const items = navFor(user.role, { mailbox: mailboxEnabled() });
  const who = {
    name: user.name,
    detail: `${roleLabel(user.role)}${user.organisationName ? ` · ${user.organisationName}` : ""}`,
  };
  return (
    <header className="relative border-b border-silt-line bg-white">
      <div className="mx-auto flex min-h-14 max-w-page items-center gap-6 px-4 sm:px-6">
        <Link
          href={ROLE_HOME[user.role]}
          className="flex shrink-0 items-center gap-2 no-underline"
          aria-label="Tributary home"
        >
          <LogoMark size={26} />
          <span className="text-lg font-semibold tracking-tight text-ink">Tributary</span>
        </Link>
        <nav aria-label="Main" className="hidden lg:block">
          <NavLinks items={items} />
        </nav>
        <div className="ml-auto hidden items-center gap-3 text-right lg:flex">
          <div className="leading-tight" data-testid="signed-in-user">
            <p className="text-sm font-semibold text-ink">{who.name}</p>
            <p className="text-xs text-silt-ink">{who.detail}</p>
          </div>
          <SignOutButton />
        </div>
        <PhoneMenu items={items} who={who} />
      </div>
    </header>
  );
}
