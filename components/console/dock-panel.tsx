"use client";

import { useId } from "react";
import { cx } from "@/components/ui/cx";

/**
 * A console panel whose body folds away behind its title. A folded panel's
 * body is not rendered at all, so a folded chart or inspector also stops
 * costing the page any work while the bench runs.
 */
export function DockPanel({
  title,
  collapsed,
  onToggle,
  actions,
  children,
  className,
}: {
  title: string;
  collapsed: boolean;
  onToggle: () => void;
  /** Extra controls beside the title (never inside the toggle button). */
  actions?: React.ReactNode;
  children: React.ReactNode;
  className?: string;
}) {
  const bodyId = useId();
  return (
    <section
      aria-label={title}
      className={cx("rounded-lg border border-paper-line bg-paper-deep/40", className)}
    >
      <div className="flex items-center gap-2 px-3 py-2">
        <h2 className="text-sm font-semibold text-ink">
          <button
            type="button"
            aria-expanded={!collapsed}
            aria-controls={bodyId}
            onClick={onToggle}
            className="flex items-center gap-1.5 rounded px-1 hover:text-copper-deep"
          >
            <span aria-hidden="true" className="inline-block w-3 text-xs text-ink-soft">
              {collapsed ? "▸" : "▾"}
            </span>
            {title}
          </button>
        </h2>
        {actions ? <div className="ml-auto">{actions}</div> : null}
      </div>
      {collapsed ? null : (
        <div id={bodyId} className="px-4 pb-4">
          {children}
        </div>
      )}
    </section>
  );
}
