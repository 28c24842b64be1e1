"use client";

import { useEffect, useId, useRef, useState } from "react";
import { usePathname } from "next/navigation";
import { NavLinks } from "./nav-links";
import { SignOutButton } from "./sign-out-button";

/**
 * The top bar below 1024 px: one disclosure button (Enter or Space opens it, Escape closes it
 * and returns to the button) that shows the links, the signed-in user and sign-out.
 */
export function PhoneMenu({
  items,
  who,
}: {
  items: { href: string; label: string }[];
  who: { name: string; detail: string };
}) {
  const [open, setOpen] = useState(false);
  const panelId = useId();
  const button = useRef<HTMLButtonElement>(null);
  const path = usePathname();
  const [shownFor, setShownFor] = useState(path);
  // following a link closes the menu (state adjusted while rendering, not in an effect)
  if (shownFor !== path) {
    setShownFor(path);
    setOpen(false);
  }

  useEffect(() => {
    if (!open) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key !== "Escape") return;
      setOpen(false);
      button.current?.focus();
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, [open]);

  return (
    <div className="ml-auto lg:hidden">
      <button
        ref={button}
        type="button"
        aria-expanded={open}
        aria-controls={panelId}
        onClick={() => setOpen((o) => !o)}
        className="inline-flex h-9 items-center gap-2 rounded border border-silt bg-white px-3 text-base font-semibold text-ink hover:bg-sand-deep"
      >
        <svg width="16" height="12" viewBox="0 0 16 12" aria-hidden="true" className="shrink-0">
          {open ? (
            <path d="M3 1 L13 11 M13 1 L3 11" stroke="currentColor" strokeWidth="1.8" fill="none" />
          ) : (
            <path d="M1 1.5 H15 M1 6 H15 M1 10.5 H15" stroke="currentColor" strokeWidth="1.8" fill="none" />
          )}
        </svg>
        Menu
      </button>
      <div
        id={panelId}
        hidden={!open}
        className="absolute inset-x-0 top-full z-20 border-b border-silt-line bg-white px-4 pb-4 pt-2 shadow-sm"
      >
        {open ? (
          <>
            <nav aria-label="Main">
              <NavLinks items={items} vertical />
            </nav>
            <div className="mt-3 flex items-center justify-between gap-3 border-t border-silt-line pt-3">
              <div className="min-w-0 leading-tight">
                <p className="text-sm font-semibold text-ink">{who.name}</p>
                <p className="text-xs text-silt-ink">{who.detail}</p>
              </div>
              <SignOutButton />
            </div>
          </>
        ) : null}
      </div>
    </div>
  );
}
