import { describe, expect, it } from "vitest";
import { testBench } from "@/components/bench-editor/model/test-bench";
import { benchGraph } from "./bench-graph";
import type { BenchLayout } from "./bench-layout";
import {
  OPEN_ZOOM_MAX,
  OPEN_ZOOM_MIN,
  openingFocus,
  openingViewport,
  revealViewport,
  TOP_CLEARANCE,
} from "./opening-view";

/** A hand-made layout: cards in a column at x 0, bars at x 500, far apart vertically. */
function tallLayout(): BenchLayout {
  return {
    devices: new Map([
      ["pb-hall", { x: 0, y: 3000 }],
      ["act-hall", { x: 0, y: 0 }],
    ]),
    addresses: new Map([
      ["2049", { x: 500, y: 0 }],
      ["2050", { x: 500, y: 60 }],
      ["2051", { x: 500, y: 120 }],
      ["6402", { x: 500, y: 180 }],
    ]),
    groups: [],
    channels: new Map(),
    lines: [],
  };
}

describe("openingViewport", () => {
  it("opens at a readable zoom, never fitted small, on the first line", () => {
    const bench = testBench();
    const { nodes } = benchGraph(bench, { layout: tallLayout() });
    const focus = openingFocus(nodes).map((n) => n.id);
    // Both test devices are on line 1.1 (hall fixture).
    expect(focus.sort()).toEqual(["d:act-hall", "d:pb-hall"]);
    const view = openingViewport(nodes, { width: 1000, height: 600 });
    expect(view.zoom).toBeGreaterThanOrEqual(OPEN_ZOOM_MIN);
    expect(view.zoom).toBeLessThanOrEqual(OPEN_ZOOM_MAX);
    // Taller than the canvas: shown from its top, with the whole width across.
    expect(view.y).toBeCloseTo(TOP_CLEARANCE);
    expect(view.x).toBeGreaterThan(0);
  });

  it("centres on the selection first, then on a device at fault", () => {
    const bench = testBench();
    const selected = benchGraph(bench, {
      layout: tallLayout(),
      selectedDevices: new Set(["pb-hall"]),
    }).nodes;
    expect(openingFocus(selected).map((n) => n.id)).toEqual(["d:pb-hall"]);
    const view = openingViewport(selected, { width: 1000, height: 600 });
    // The selected card (y 3000 in canvas units) is on screen.
    const top = 3000 * view.zoom + view.y;
    expect(top).toBeGreaterThan(0);
    expect(top).toBeLessThan(600);
    const faulty = benchGraph(bench, {
      layout: tallLayout(),
      faults: new Map([["act-hall", ["bus.silent"]]]),
    }).nodes;
    expect(openingFocus(faulty).map((n) => n.id)).toEqual(["d:act-hall"]);
  });

  it("counts a device on a unit link only (no individual address) with the first line", () => {
    const bench = testBench();
    bench.devices.push({ id: "iu", type: "indoor-unit", name: "Indoor", parameters: {} });
    const layout = tallLayout();
    (layout.devices as Map<string, { x: number; y: number }>).set("iu", { x: 0, y: -400 });
    const { nodes } = benchGraph(bench, { layout });
    expect(
      openingFocus(nodes)
        .map((n) => n.id)
        .sort(),
    ).toEqual(["d:act-hall", "d:iu", "d:pb-hall"]);
    // Shown from the top of the column, where the indoor unit sits.
    expect(openingViewport(nodes, { width: 1000, height: 600 }).y).toBeCloseTo(
      TOP_CLEARANCE + 400 * 0.9,
    );
  });

  it("pans to devices that newly report a fault: none when in view, else the top one", () => {
    const { nodes } = benchGraph(testBench(), { layout: tallLayout() });
    const devices = nodes.filter((n) => n.type === "device");
    const size = { width: 1000, height: 600 };
    const atTop = { x: 0, y: 0, zoom: 1 };
    const act = devices.filter((n) => n.id === "d:act-hall");
    expect(revealViewport(act, atTop, size)).toBeUndefined();
    // Both cards (y 0 and y 3000) cannot fit at this zoom: the top one is centred.
    const both = revealViewport(devices, { x: 0, y: -2900, zoom: 1 }, size)!;
    expect(both.zoom).toBe(1);
    const actTop = 0 * both.zoom + both.y;
    expect(actTop).toBeGreaterThan(0);
    expect(actTop).toBeLessThan(600);
  });

  it("opens an empty bench at zoom 1 at the origin", () => {
    expect(openingViewport([], { width: 800, height: 600 })).toEqual({ x: 0, y: 0, zoom: 1 });
  });
});
