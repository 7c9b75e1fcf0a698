import { act, render, screen } from "@testing-library/react";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
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
