import { cleanup, fireEvent, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { CollapsibleNav } from "./collapsible-nav";

vi.mock("next/navigation", () => ({ usePathname: () => "/benches" }));

afterEach(cleanup);

describe("CollapsibleNav", () => {
  it("starts folded behind its Menu button on narrow screens and opens from it", () => {
    render(
      <CollapsibleNav brand={<span>Benchline</span>}>
        <nav aria-label="Studio">links</nav>
      </CollapsibleNav>,
    );
    const menu = screen.getByRole("button", { name: "Menu" });
    const panel = screen.getByTestId("studio-nav-panel");
    expect(menu.getAttribute("aria-expanded")).toBe("false");
    expect(menu.getAttribute("aria-controls")).toBe(panel.id);
    // Folded: hidden below xl (the xl: classes show it on wide screens).
    expect(panel.className).toMatch(/(^| )hidden( |$)/);
    fireEvent.click(menu);
    expect(menu.getAttribute("aria-expanded")).toBe("true");
    expect(panel.className).not.toMatch(/(^| )hidden( |$)/);
  });
});
