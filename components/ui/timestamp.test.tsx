import { act, cleanup, render, screen } from "@testing-library/react";
import { renderToString } from "react-dom/server";
import { afterEach, describe, expect, it, vi } from "vitest";
import { Timestamp } from "./timestamp";

afterEach(() => {
  cleanup();
  vi.useRealTimers();
});

describe("Timestamp", () => {
  it("shows the one date format in a <time> element with the machine-readable value", () => {
    render(<Timestamp value="2026-12-02T14:05:00.000Z" />);
    const time = screen.getByText("2026-12-02 14:05 UTC");
    expect(time.tagName).toBe("TIME");
    expect(time.getAttribute("datetime")).toBe("2026-12-02T14:05:00.000Z");
  });

  it("renders no relative part on the server, so hydration text agrees", () => {
    const html = renderToString(<Timestamp value="2026-12-02T14:05:00.000Z" relative />);
    expect(html).toContain("2026-12-02 14:05 UTC");
    expect(html).not.toContain("ago");
  });

  it("adds how long ago it was in the browser and keeps it current", () => {
    vi.useFakeTimers({ now: new Date("2026-12-02T14:08:00.000Z") });
    render(<Timestamp value="2026-12-02T14:05:00.000Z" relative />);
    expect(screen.getByText("2026-12-02 14:05 UTC (3 min ago)")).toBeTruthy();
    act(() => {
      vi.advanceTimersByTime(60_000);
    });
    expect(screen.getByText("2026-12-02 14:05 UTC (4 min ago)")).toBeTruthy();
  });

  it("shows a due day with how soon it is, from the current time even after the clock stood still", async () => {
    vi.useFakeTimers({ now: new Date("2026-12-02T04:30:00.000Z") });
    render(<Timestamp value="2026-12-09T04:30:00.000Z" dateOnly relative />);
    await act(async () => {});
    expect(screen.getByText("2026-12-09 (in 7 days)")).toBeTruthy();
  });
});
