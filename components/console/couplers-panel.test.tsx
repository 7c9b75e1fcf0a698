import { act, cleanup, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { SimStoreProvider } from "@/components/sim/sim-context";
import type { BenchSummary, CouplerTotals } from "@/components/sim/sim-protocol";
import { createSimStore } from "@/components/sim/sim-store";
import { CouplersPanel } from "./couplers-panel";

afterEach(cleanup);

const coupler = (id: string, name: string, individualAddress: string) => ({
  id,
  name,
  type: "coupler",
  typeLabel: "Coupler",
  medium: "knx" as const,
  individualAddress,
  buttons: [],
  objects: [],
  unitLinks: [],
  role: null,
});

const bench: BenchSummary = {
  name: "Two floors",
  lines: [
    { id: "m1", name: "Main line", address: "1.0" },
    { id: "l11", name: "Floor 1", address: "1.1" },
    { id: "l12", name: "Floor 2", address: "1.2" },
  ],
  testToolAddress: "1.1.250",
  groupAddresses: [],
  devices: [coupler("c11", "Floor 1 coupler", "1.1.0"), coupler("c12", "Floor 2 coupler", "1.2.0")],
  unitLinks: [],
  controlPanelTiles: [],
};

const zero = { filter: 0, blocked: 0, "hop-count": 0, "queue-full": 0, "not-acknowledged": 0 };

function mount() {
  const store = createSimStore();
  store.getState().apply({
    type: "loaded",
    bench,
    document: {
      format: 2,
      name: "Two floors",
      lines: [],
      testToolAddress: "1.1.250",
      groupAddresses: [],
      devices: [],
      links: [],
      unitLinks: [],
    },
    clock: { nowUs: 0, running: false, speed: 1 },
    fresh: true,
  });
  render(
    <SimStoreProvider store={store} send={() => {}}>
      <CouplersPanel />
    </SimStoreProvider>,
  );
  return store;
}

function batch(couplers: CouplerTotals[]) {
  return {
    type: "batch" as const,
    seq: 1,
    clock: { nowUs: 1_000_000, running: true, speed: 1 as const },
    rows: [],
    dropped: 0,
    devices: [],
    rooms: [],
    busLoad: [],
    rates: [],
    couplers,
  };
}

describe("CouplersPanel", () => {
  it("lists every coupler with the lines it joins, at zero before any traffic", () => {
    mount();
    const table = screen.getByRole("table", { name: "Coupler totals since the run started" });
    const first = within(table).getByRole("row", { name: /1\.1\.0 Floor 1 coupler/ });
    expect(first.textContent).toContain("1.1 – 1.0");
    expect(
      within(first)
        .getAllByRole("cell")
        .map((c) => c.textContent),
    ).toEqual(["1.1 – 1.0", "0", "0", "0"]);
  });

  it("shows running totals as batches bring them, drops with their reasons", () => {
    const store = mount();
    act(() =>
      store.getState().apply(
        batch([
          { id: "c11", forwarded: 12, held: 2, dropped: { ...zero, "queue-full": 1 } },
          { id: "c12", forwarded: 3, held: 0, dropped: { ...zero, filter: 4 } },
        ]),
      ),
    );
    const c11 = screen.getByTestId("coupler-totals-c11");
    expect(
      within(c11)
        .getAllByRole("cell")
        .map((c) => c.textContent),
    ).toEqual(["1.1 – 1.0", "12", "2", "1buffer full 1"]);
    // A full buffer lost a telegram: the fault colour. A filter-table drop is the coupler at work.
    expect(within(c11).getAllByRole("cell")[3]!.className).toContain("text-fault");
    const c12 = screen.getByTestId("coupler-totals-c12");
    expect(within(c12).getAllByRole("cell")[3]!.textContent).toBe("4not in filter table 4");
    expect(within(c12).getAllByRole("cell")[3]!.className).not.toContain("text-fault");
  });
});
