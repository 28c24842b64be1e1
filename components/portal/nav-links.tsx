"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { cx } from "@/components/ui/cx";

/** The top-bar links; the current section is marked for sight and for screen readers. */
export function NavLinks({
  items,
  vertical = false,
}: {
  items: { href: string; label: string }[];
  /** one link a line, as in the phone menu */
  vertical?: boolean;
}) {
  const path = usePathname();
  // the longest matching prefix wins, so /admin/users does not also light up Home (/admin)
  const current = items
    .filter((i) => path === i.href || path.startsWith(`${i.href}/`))
    .sort((a, b) => b.href.length - a.href.length)[0]?.href;
  return (
    <ul className={vertical ? "grid gap-0.5" : "flex flex-wrap items-center gap-1"}>
      {items.map((i) => (
        <li key={i.href}>
          <Link
            href={i.href}
            aria-current={i.href === current ? "page" : undefined}
            className={cx(
              vertical
                ? "block rounded px-2.5 py-2 text-md font-semibold no-underline"
                : "block rounded px-2.5 py-1.5 text-base font-semibold no-underline",
              i.href === current ? "bg-shallows text-ink" : "text-ink-soft hover:bg-sand-deep hover:text-ink",
            )}
          >
            {i.label}
          </Link>
        </li>
      ))}
    </ul>
  );
}
