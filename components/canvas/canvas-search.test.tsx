import { render, screen } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { createRef } from "react";
import { describe, expect, it, vi } from "vitest";
import { testBench } from "@/components/bench-editor/model/test-bench";
import { CanvasSearch } from "./canvas-search";

describe("CanvasSearch", () => {
  it("is a combobox whose options the arrow keys walk and Enter reveals", async () => {
    const onReveal = vi.fn();
    render(<CanvasSearch bench={testBench()} inputRef={createRef()} onReveal={onReveal} />);
    const input = screen.getByRole("combobox", {
      name: "Search the canvas for an address or device",
    });
    expect(input.getAttribute("aria-expanded")).toBe("false");
    await userEvent.type(input, "1/0");
    expect(input.getAttribute("aria-expanded")).toBe("true");
    const options = screen.getAllByRole("option");
    expect(options.length).toBeGreaterThan(1);
    // No control nested in an option: the option itself is what is chosen.
    expect(options[0]!.querySelector("button")).toBeNull();
    expect(input.getAttribute("aria-activedescendant")).toBe(options[0]!.id);
    await userEvent.keyboard("{ArrowDown}");
    expect(input.getAttribute("aria-activedescendant")).toBe(options[1]!.id);
    expect(options[1]!.getAttribute("aria-selected")).toBe("true");
    await userEvent.keyboard("{Enter}");
    expect(onReveal).toHaveBeenCalledWith({ kind: "group-address", address: "1/0/2" });
  });
});
