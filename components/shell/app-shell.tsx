import Link from "next/link";
import { BenchMark } from "./bench-mark";
import { CollapsibleNav } from "./collapsible-nav";
import { type NavItem, navItems } from "./nav-items";
import { NavList } from "./nav-list";

/**
 * The frame every studio page sits in: a graphite rail with the product name
 * and the navigation (a top bar with a Menu button below 1280 px), and a
 * paper work area. `account` is where the signed-in user and workspace
 * switcher go; `items` narrows the navigation (the studio layout passes only
 * the pages the member's role may open).
 */
export function AppShell({
  children,
  account,
  items = navItems,
}: {
  children: React.ReactNode;
  account?: React.ReactNode;
  items?: readonly NavItem[];
}) {
  return (
    <div className="flex min-h-screen flex-col xl:flex-row">
      <CollapsibleNav
        brand={
          <Link
            href="/"
            className="flex items-center gap-2 px-3 text-lg font-semibold tracking-tight"
          >
            <BenchMark className="size-7" />
            Benchline
          </Link>
        }
      >
        <NavList items={items} />
        {account ? <div className="mt-auto px-3 text-sm">{account}</div> : null}
      </CollapsibleNav>
      <main className="min-w-0 flex-1 bg-paper">{children}</main>
    </div>
  );
}
