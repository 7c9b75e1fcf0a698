import { cleanup, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { NavItem } from "./nav-items";
import { navItems } from "./nav-items";
import { NavList } from "./nav-list";

const pathname = vi.hoisted(() => ({ current: "/" }));
vi.mock("next/navigation", () => ({ usePathname: () => pathname.current }));

const items: readonly NavItem[] = [
  { href: "/benches", label: "Benches", summary: "Build benches.", ready: true },
  { href: "/runs", label: "Runs", summary: "Run history.", ready: true },
  { href: "/labs", label: "Labs", summary: "Training labs.", ready: false },
];

afterEach(cleanup);

describe("NavList", () => {
  it("links ready pages and marks the current section, including its sub-pages", () => {
    pathname.current = "/benches/abc";
    render(<NavList items={items} />);
    const benches = screen.getByRole("link", { name: "Benches" });
    expect(benches.getAttribute("href")).toBe("/benches");
    expect(benches.getAttribute("aria-current")).toBe("page");
    expect(screen.getByRole("link", { name: "Runs" }).getAttribute("aria-current")).toBeNull();
  });

  it("lists an unbuilt page without linking to it", () => {
    pathname.current = "/";
    render(<NavList items={items} />);
    expect(screen.queryByRole("link", { name: /Labs/ })).toBeNull();
    expect(screen.getByText("Labs").getAttribute("aria-disabled")).toBe("true");
  });

  it("keeps every route unique in the one navigation list", () => {
    const hrefs = navItems.map((item) => item.href);
    expect(new Set(hrefs).size).toBe(hrefs.length);
  });
});
