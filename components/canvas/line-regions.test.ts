import ELK from "elkjs/lib/elk.bundled.js";
import { describe, expect, it } from "vitest";
import { benchSchema, type Bench } from "@/engine";
import { benchGraph, type BenchNode } from "./bench-graph";
import { layoutBench } from "./bench-layout";
import { COUPLER_HEIGHT, deviceLines, orderedLines } from "./line-regions";

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

  it("draws one region per line around its cards, in order, without overlaps", async () => {
    const bench = building();
    const { nodes } = benchGraph(bench, { layout: await layoutBench(bench, elk) });
    const regions = of(nodes, "lineRegion");
    expect(regions.map((r) => r.data.address)).toEqual(["0.0", "1.0", "1.1", "1.2"]);
    expect(regions.map((r) => r.data.kind)).toEqual(["backbone", "main", "line", "line"]);
    for (let i = 1; i < regions.length; i++)
      expect(regions[i]!.position.y).toBeGreaterThan(
        regions[i - 1]!.position.y + regions[i - 1]!.data.height,
      );
    // Device counts: KNX devices only (the indoor unit has no individual address); couplers count.
    expect(regions.find((r) => r.data.address === "1.2")!.data.deviceCount).toBe(3);
    const region = (address: string) => regions.find((r) => r.data.address === address)!;
    for (const card of of(nodes, "device")) {
      const line = deviceLines(bench).get(card.data.device.id)!;
      const box = region(bench.lines.find((l) => l.id === line)!.address);
      expect(card.position.y).toBeGreaterThan(box.position.y);
      expect(card.position.y).toBeLessThan(box.position.y + box.data.height);
    }
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
