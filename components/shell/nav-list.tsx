"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { cx } from "../ui/cx";
import type { NavItem } from "./nav-items";

/** The shell's navigation; marks the current section, lists unbuilt pages without a link. */
export function NavList({ items }: { items: readonly NavItem[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Studio">
      <ul className="flex flex-col gap-0.5">
        {items.map((item) => {
          const current = pathname === item.href || pathname.startsWith(`${item.href}/`);
          if (!item.ready) {
            return (
              <li key={item.href}>
                <span
                  className="flex items-center justify-between rounded-md px-3 py-2 text-sm text-graphite-muted/70"
                  title={`${item.summary} (not built yet)`}
                  aria-disabled="true"
                >
                  {item.label}
                  <span className="text-[10px] tracking-wide uppercase">soon</span>
                </span>
              </li>
            );
          }
          return (
            <li key={item.href}>
              <Link
                href={item.href}
                title={item.summary}
                aria-current={current ? "page" : undefined}
                className={cx(
                  "flex items-center rounded-md border-l-2 px-3 py-2 text-sm transition-colors",
                  current
                    ? "border-copper bg-graphite-raised text-graphite-text"
                    : "border-transparent text-graphite-muted hover:bg-graphite-raised hover:text-graphite-text",
                )}
              >
                {item.label}
              </Link>
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
