import ELK from "elkjs/lib/elk.bundled.js";
import { describe, expect, it } from "vitest";
import { benchSchema, type Bench } from "@/engine";
import { benchGraph, type BenchNode } from "./bench-graph";
import { layoutBench } from "./bench-layout";
import { COUPLER_HEIGHT, COUPLER_WIDTH, deviceLines, orderedLines } from "./line-regions";

const elk = new ELK();

/** Backbone, main line 1.0, lines 1.1 and 1.2 with a coupler each; a gateway and its unit on 1.2. */
function building(): Bench {
  return benchSchema.parse({
    format: 2,
    name: "Two floors",
    testToolAddress: "0.0.250",
    // Listed out of order on purpose: the canvas stacks them by address.
    lines: [
      { id: "floor-2", address: "1.2", name: "Floor 2" },
      { id: "backbone", address: "0.0", name: "Backbone" },
      { id: "floor-1", address: "1.1", name: "Floor 1" },
      { id: "main", address: "1.0", name: "Main line" },
    ],
    groupAddresses: [{ address: "1/0/1", name: "All off", dpt: "1.001" }],
    devices: [
      { id: "pb-1", type: "push-button", name: "Push-button floor 1", individualAddress: "1.1.1" },
      { id: "pb-2", type: "push-button", name: "Push-button floor 2", individualAddress: "1.2.1" },
      { id: "lc-1", type: "coupler", name: "Floor 1 coupler", individualAddress: "1.1.0" },
      { id: "lc-2", type: "coupler", name: "Floor 2 coupler", individualAddress: "1.2.0" },
      { id: "ac-1", type: "coupler", name: "Area 1 coupler", individualAddress: "1.0.0" },
      { id: "gw-2", type: "hvac-gateway", name: "Gateway floor 2", individualAddress: "1.2.2" },
      { id: "iu-2", type: "indoor-unit", name: "Indoor unit floor 2" },
    ],
    links: [{ device: "pb-1", object: 0, groupAddress: "1/0/1" }],
    unitLinks: [{ id: "ul-2", members: ["gw-2", "iu-2"] }],
  });
}

const of = <T extends BenchNode["type"]>(nodes: readonly BenchNode[], type: T) =>
  nodes.filter((n): n is Extract<BenchNode, { type: T }> => n.type === type);

describe("line regions", () => {
  it("stacks lines backbone first, then each area's main line and its lines", () => {
    expect(orderedLines(building()).map((l) => l.address)).toEqual(["0.0", "1.0", "1.1", "1.2"]);
  });

  it("puts a device on a unit link only in its partner's line", () => {
    const lines = deviceLines(building());
    expect(lines.get("iu-2")).toBe("floor-2");
    expect(lines.get("lc-1")).toBe("floor-1");
    expect(lines.get("ac-1")).toBe("main");
  });

  it("draws the lines as a tree of regions: backbone, main line below it, its lines side by side below that", async () => {
    const bench = building();
    const { nodes } = benchGraph(bench, { layout: await layoutBench(bench, elk) });
    const regions = of(nodes, "lineRegion");
    expect(regions.map((r) => r.data.address)).toEqual(["0.0", "1.0", "1.1", "1.2"]);
    expect(regions.map((r) => r.data.kind)).toEqual(["backbone", "main", "line", "line"]);
    const region = (address: string) => regions.find((r) => r.data.address === address)!;
    const bottom = (address: string) => region(address).position.y + region(address).data.height;
    const right = (address: string) => region(address).position.x + region(address).data.width;
    // Each line below the line its coupler joins it to (knx-reference.md, Topology).
    expect(region("1.0").position.y).toBeGreaterThan(bottom("0.0"));
    expect(region("1.1").position.y).toBeGreaterThan(bottom("1.0"));
    expect(region("1.2").position.y).toBe(region("1.1").position.y);
    // Floors side by side, both under the main line, which spans them.
    expect(region("1.2").position.x).toBeGreaterThan(right("1.1"));
    expect(region("1.0").position.x).toBeLessThanOrEqual(region("1.1").position.x);
    expect(right("1.0")).toBeGreaterThanOrEqual(right("1.2"));
    // Device counts: KNX devices only (the indoor unit has no individual address); couplers count.
    expect(region("1.2").data.deviceCount).toBe(3);
    for (const card of of(nodes, "device")) {
      const line = deviceLines(bench).get(card.data.device.id)!;
      const box = region(bench.lines.find((l) => l.id === line)!.address);
      expect(card.position.y).toBeGreaterThan(box.position.y);
      expect(card.position.y).toBeLessThan(box.position.y + box.data.height);
      expect(card.position.x).toBeGreaterThanOrEqual(box.position.x);
      expect(card.position.x).toBeLessThan(box.position.x + box.data.width);
    }
    // Every card left of every bus-bar, so the wires run one way.
    const cardsRight = Math.max(...of(nodes, "device").map((n) => n.position.x + 248));
    expect(Math.min(...of(nodes, "busBar").map((n) => n.position.x))).toBeGreaterThan(cardsRight);
  });

  it("draws each coupler across the top border of its line, the boundary with the line above", async () => {
    const bench = building();
    const { nodes } = benchGraph(bench, { layout: await layoutBench(bench, elk) });
    const regions = of(nodes, "lineRegion");
    const couplers = of(nodes, "coupler");
    expect(couplers.map((c) => c.data.device.id).sort()).toEqual(["ac-1", "lc-1", "lc-2"]);
    // Couplers are not drawn as cards as well.
    expect(of(nodes, "device").some((d) => d.data.device.type === "coupler")).toBe(false);
    for (const coupler of couplers) {
      const own = regions.find((r) => r.data.address === coupler.data.address.replace(/\.0$/, ""))!;
      expect(coupler.position.y + COUPLER_HEIGHT / 2).toBe(own.position.y);
      // Its upper half in the gap below the line above, which spans over it.
      const upper = regions.find((r) => r.data.address === coupler.data.upperLine)!;
      expect(coupler.position.y).toBeGreaterThanOrEqual(upper.position.y + upper.data.height);
      expect(coupler.position.x).toBeGreaterThanOrEqual(upper.position.x);
      expect(coupler.position.x + COUPLER_WIDTH).toBeLessThanOrEqual(
        upper.position.x + upper.data.width,
      );
    }
    // knx-reference.md, Topology: a line coupler a.l.0 joins line a.l to main line a.0, an
    // area coupler a.0.0 joins main line a.0 to the backbone 0.0.
    expect(couplers.find((c) => c.id === "d:lc-2")!.data.upperLine).toBe("1.0");
    expect(couplers.find((c) => c.id === "d:ac-1")!.data.upperLine).toBe("0.0");
  });

  it("draws no regions on a bench of one line", async () => {
    const bench = { ...building(), lines: [{ id: "floor-1", address: "1.1", name: "Floor 1" }] };
    bench.devices = bench.devices.filter((d) => d.type !== "coupler");
    const { nodes } = benchGraph(bench, { layout: await layoutBench(bench, elk) });
    expect(of(nodes, "lineRegion")).toEqual([]);
  });
});
