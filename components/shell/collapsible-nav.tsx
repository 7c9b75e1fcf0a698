"use client";

import { usePathname } from "next/navigation";
import { useId, useState } from "react";
import { cx } from "../ui/cx";

/**
 * The shell's rail on wide screens; below 1280 px (a tablet, a half-screen
 * window) it folds into a top bar with a Menu button, so the work area gets
 * the whole width. Opening a page folds it again.
 */
export function CollapsibleNav({
  brand,
  children,
}: {
  brand: React.ReactNode;
  children: React.ReactNode;
}) {
  const pathname = usePathname();
  // Open for the page it was opened on: a new page finds it folded again.
  const [openOn, setOpenOn] = useState<string | null>(null);
  const open = openOn === pathname;
  const panelId = useId();
  return (
    <aside className="flex shrink-0 flex-col bg-graphite text-graphite-text xl:w-60 xl:gap-6 xl:px-3 xl:py-4">
      <div className="flex items-center justify-between gap-3 px-3 py-2 xl:p-0">
        {brand}
        <button
          type="button"
          className="rounded-md border border-graphite-line px-3 py-1.5 text-sm hover:bg-graphite-raised xl:hidden"
          aria-expanded={open}
          aria-controls={panelId}
          onClick={() => setOpenOn(open ? null : pathname)}
        >
          <span aria-hidden="true">{open ? "✕ " : "☰ "}</span>
          Menu
        </button>
      </div>
      <div
        id={panelId}
        data-testid="studio-nav-panel"
        className={cx("flex-1 flex-col gap-6 px-3 pb-4 xl:flex xl:p-0", open ? "flex" : "hidden")}
      >
        {children}
      </div>
    </aside>
  );
}
