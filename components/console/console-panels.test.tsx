import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterAll, afterEach, beforeAll, describe, expect, it } from "vitest";
import { SimStoreProvider } from "@/components/sim/sim-context";
import type { BenchSummary, LogRow, SimCommand } from "@/components/sim/sim-protocol";
import { createSimStore } from "@/components/sim/sim-store";
import { ControlPad } from "./control-pad";
import { TelegramLog } from "./telegram-log";
import { TimeControls } from "./time-controls";

afterEach(cleanup);

// jsdom lays nothing out; the log's virtualizer reads its viewport's height from clientHeight.
beforeAll(() =>
  Object.defineProperty(HTMLElement.prototype, "clientHeight", {
    configurable: true,
    get: () => 384,
  }),
);
afterAll(() => Reflect.deleteProperty(HTMLElement.prototype, "clientHeight"));

const bench: BenchSummary = {
  name: "Test bench",
  lines: [{ id: "line-a", name: "Lab room line", address: "1.1" }],
  testToolAddress: "1.1.250",
  groupAddresses: [
    { raw: 1, address: "0/0/1", name: "Ceiling light", dpt: "1.001" },
    { raw: 2, address: "0/0/2", name: "Door sign", dpt: "16.001" },
  ],
  devices: [
    {
      id: "act-1",
      name: "Lighting actuator",
      type: "switch-actuator",
      typeLabel: "Switch actuator",
      medium: "knx",
      individualAddress: "1.1.10",
      buttons: [],
      objects: [],
      unitLinks: [],
      role: null,
    },
  ],
  unitLinks: [],
  controlPanelTiles: [],
};

function row(seq: number, overrides: Partial<LogRow>): LogRow {
  return {
    seq,
    kind: "telegram",
    timeUs: seq * 1_000,
    line: "1.1",
    source: "1.1.250",
    deviceId: "",
    destination: "0/0/1",
    destinationName: "Ceiling light",
    service: "GroupValue_Write",
    value: "On",
    priority: "low",
    repeated: false,
    ack: "ack",
    rawHex: "BC 11 FA 00 01 E1 00 81 00",
    ...overrides,
  };
}

function mount(children: React.ReactNode, sent: SimCommand[] = []) {
  const store = createSimStore();
  store.getState().apply({
    type: "loaded",
    bench,
    document: {
      format: 2,
      name: "Test bench",
      lines: [{ id: "line-1", address: "1.1", name: "Test line" }],
      testToolAddress: "1.1.250",
      groupAddresses: [],
      devices: [],
      links: [],
      unitLinks: [],
    },
    clock: { nowUs: 0, running: false, speed: 10 },
    fresh: true,
  });
  render(
    <SimStoreProvider store={store} send={(command) => sent.push(command)}>
      {children}
    </SimStoreProvider>,
  );
  return store;
}

const nextFrame = () => act(() => new Promise((resolve) => requestAnimationFrame(resolve)));

describe("TelegramLog rows", () => {
  it("names sender and destination, and shows an empty text as (empty)", async () => {
    const store = mount(<TelegramLog />);
    act(() =>
      store.getState().apply({
        type: "batch",
        seq: 1,
        clock: { nowUs: 10_000, running: true, speed: 10 },
        rows: [
          row(1, { source: "1.1.10", deviceId: "act-1" }),
          row(2, { destination: "0/0/2", destinationName: "Door sign", value: '""' }),
        ],
        dropped: 0,
        devices: [],
        rooms: [],
        busLoad: [],
        rates: [],
      }),
    );
    await nextFrame();
    await nextFrame();
    const rows = within(screen.getByRole("table", { name: "Telegram log" })).getAllByRole("row");
    expect(rows).toHaveLength(3);
    const cells = (r: HTMLElement) =>
      within(r)
        .getAllByRole("cell")
        .map((c) => c.textContent);
    expect(cells(rows[1]!).slice(0, 4)).toEqual([
      "0:00:00.001",
      "1.1",
      "1.1.10 Lighting actuator",
      "0/0/1 Ceiling light",
    ]);
    expect(cells(rows[2]!)[2]).toBe("1.1.250 test tool");
    expect(cells(rows[2]!)[5]).toBe("(empty)");
  });
});

describe("TimeControls", () => {
  it("offers Run while paused and Pause while running, with the state in words", async () => {
    const sent: SimCommand[] = [];
    const store = mount(<TimeControls />, sent);
    expect(screen.getByTestId("run-state").textContent).toContain("Paused");
    fireEvent.click(screen.getByRole("button", { name: "Run" }));
    expect(sent).toEqual([{ type: "play", speed: 10 }]);
    act(() =>
      store.getState().apply({
        type: "reset-done",
        clock: { nowUs: 0, running: true, speed: 10 },
      }),
    );
    await nextFrame();
    expect(screen.getByTestId("run-state").textContent).toContain("Running at 10x");
    expect(screen.queryByRole("button", { name: "Run" })).toBeNull();
    fireEvent.click(screen.getByRole("button", { name: "Pause" }));
    expect(sent.at(-1)).toEqual({ type: "pause" });
  });
});

describe("ControlPad address picker", () => {
  it("is a combobox whose options hold no buttons and are chosen with the arrows and Enter", () => {
    mount(<ControlPad />);
    const input = screen.getByRole("combobox", { name: "Group address" });
    const list = screen.getByRole("listbox", { name: "Matching group addresses" });
    expect(within(list).queryAllByRole("button")).toEqual([]);
    fireEvent.keyDown(input, { key: "ArrowDown" });
    fireEvent.keyDown(input, { key: "ArrowDown" });
    const active = input.getAttribute("aria-activedescendant");
    expect(document.getElementById(active!)?.textContent).toContain("Door sign");
    fireEvent.keyDown(input, { key: "Enter" });
    expect((input as HTMLInputElement).value).toBe("0/0/2 Door sign");
    expect(screen.getByRole("button", { name: "Write" })).toBeTruthy();
  });
});
