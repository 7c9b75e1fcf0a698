import { act, cleanup, render, screen } from "@testing-library/react";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { SimStoreProvider } from "@/components/sim/sim-context";
import type { LogRow } from "@/components/sim/sim-protocol";
import { createSimStore } from "@/components/sim/sim-store";
import { TelegramLog } from "./telegram-log";

function rows(from: number, count: number): LogRow[] {
  return Array.from({ length: count }, (_, i) => ({
    seq: from + i,
    kind: "telegram" as const,
    timeUs: (from + i) * 20_000,
    line: "1.1",
    source: "1.1.250",
    deviceId: "",
    destination: (from + i) % 10 === 0 ? "2/0/2" : "1/0/1",
    destinationName: "Ceiling light",
    service: "GroupValue_Write",
    value: "On",
    priority: "low",
    repeated: false,
    ack: "ack" as const,
    rawHex: "BC 11 FA 08 01 E1 00 81 C5",
  }));
}

function batch(seq: number, batchRows: LogRow[]) {
  return {
    type: "batch" as const,
    seq,
    clock: { nowUs: 0, running: true, speed: "max" as const },
    rows: batchRows,
    dropped: 0,
    devices: [],
    rooms: [],
    busLoad: [],
    rates: [],
  };
}

// jsdom lays nothing out; the log's virtualizer reads its viewport's height from clientHeight.
beforeAll(() =>
  Object.defineProperty(HTMLElement.prototype, "clientHeight", {
    configurable: true,
    get: () => 384,
  }),
);
afterAll(() => Reflect.deleteProperty(HTMLElement.prototype, "clientHeight"));
afterEach(cleanup);

describe("TelegramLog", () => {
  it("renders only the visible window of 100,000 rows", async () => {
    const store = createSimStore();
    render(
      <SimStoreProvider store={store} send={() => undefined}>
        <TelegramLog />
      </SimStoreProvider>,
    );
    act(() => {
      for (let b = 0; b < 20; b++) store.getState().apply(batch(b, rows(b * 5_000, 5_000)));
    });
    // The log re-renders on the next animation frame, not per batch.
    await act(() => new Promise((resolve) => requestAnimationFrame(resolve)));
    expect(screen.getByTestId("log-count").textContent).toBe("100000");
    const log = screen.getByRole("table", { name: "Telegram log" });
    // The header row plus the visible window (and its overscan), never the whole log.
    const rendered = log.querySelectorAll("[role=row]").length;
    expect(rendered).toBeGreaterThan(10);
    expect(rendered).toBeLessThan(60);
  });
});

describe("TelegramLog on a bench with couplers", () => {
  it("shows each telegram's line and what a coupler did with it", async () => {
    const store = createSimStore();
    render(
      <SimStoreProvider store={store} send={() => undefined}>
        <TelegramLog />
      </SimStoreProvider>,
    );
    const [sent] = rows(0, 1);
    const base = { ...sent!, destination: "4/0/1", destinationName: "All lights off" };
    act(() => {
      store.getState().apply(
        batch(0, [
          { ...base, seq: 0, line: "1.0", source: "1.0.1" },
          {
            ...base,
            seq: 1,
            line: "1.2",
            source: "1.0.1",
            deviceId: "lc-floor-2",
            coupler: { id: "lc-floor-2", action: "forward", toLine: "1.2" },
          },
          {
            ...base,
            seq: 2,
            kind: "coupler",
            line: "1.0",
            source: "Floor 3 line coupler",
            deviceId: "lc-floor-3",
            service: "coupler drop",
            value: "not passed to line 1.3: queue-full",
            coupler: { id: "lc-floor-3", action: "drop", reason: "queue-full", toLine: "1.3" },
            ack: "",
            rawHex: "",
          },
        ]),
      );
    });
    await act(() => new Promise((resolve) => requestAnimationFrame(resolve)));
    const log = screen.getByRole("table", { name: "Telegram log" });
    expect(screen.getAllByRole("columnheader")[1]!.textContent).toBe("Line");
    const cells = [...log.querySelectorAll("[role=row][data-kind]")].map(
      (row) => row.querySelectorAll("[role=cell]")[1]!.textContent,
    );
    expect(cells).toEqual([
      "1.0",
      "1.2 ⇅passed onto line 1.2 by lc-floor-2",
      "1.0 ⊘dropped by lc-floor-3 for line 1.3: queue-full",
    ]);
    // A full buffer is a fault; the drop row reads as one.
    const drop = log.querySelector("[data-coupler=drop]")!;
    expect(drop.className).toContain("text-fault");
    expect(drop.textContent).toContain("Dropped");
  });
});
