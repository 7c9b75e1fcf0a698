import { describe, expect, it } from "vitest";
import { testBench } from "@/components/bench-editor/model/test-bench";
import ELK from "elkjs/lib/elk.bundled.js";
import { benchGraph, type LinkEdge } from "./bench-graph";
import { layoutBench } from "./bench-layout";
import { dptFamily } from "./dpt-family";

// The layout test runs elkjs, whose first layout is slow on a busy machine.
describe("benchGraph", { timeout: 60_000 }, () => {
  it("draws a card per device, a bus-bar per address and marks each object's sending link", () => {
    const { nodes, edges } = benchGraph(testBench());
    expect(nodes.filter((n) => n.type === "device").map((n) => n.id)).toEqual([
      "d:pb-hall",
      "d:act-hall",
    ]);
    expect(nodes.filter((n) => n.type === "busBar")).toHaveLength(4);
    const links = edges.filter((e) => e.type === "link");
    expect(
      links.map((e) => [
        e.source,
        e.sourceHandle,
        e.target,
        e.data && "sending" in e.data && e.data.sending,
      ]),
    ).toEqual([
      ["d:pb-hall", "o:0", "g:2049", true],
      ["d:act-hall", "o:0", "g:2049", true],
      ["d:act-hall", "o:1", "g:2050", true],
    ]);
  });

  it("chains a unit link through its members and lays out nodes without positions apart", async () => {
    const bench = testBench();
    bench.devices.push(
      {
        id: "gw",
        type: "hvac-gateway",
        name: "Gateway",
        individualAddress: "1.1.9",
        parameters: {},
      },
      { id: "iu", type: "indoor-unit", name: "Indoor", parameters: {} },
    );
    bench.unitLinks.push({ id: "wiring", members: ["gw", "iu"] });
    const { nodes, edges } = benchGraph(bench, { layout: await layoutBench(bench, new ELK()) });
    expect(edges.filter((e) => e.type === "unitLink").map((e) => [e.source, e.target])).toEqual([
      ["d:gw", "d:iu"],
    ]);
    const positions = new Set(nodes.map((n) => `${n.position.x},${n.position.y}`));
    expect(positions.size).toBe(nodes.length);
  });

  it("fades the wires away from the selection when wires focus on it", () => {
    const faded = (selectedDevices: Set<string>) =>
      benchGraph(testBench(), { focusWires: true, selectedDevices })
        .edges.filter((e): e is LinkEdge => e.type === "link")
        .map((e) => [e.data!.device, e.data!.object, e.data!.dimmed === true]);
    expect(faded(new Set(["act-hall"]))).toEqual([
      ["pb-hall", 0, true],
      ["act-hall", 0, false],
      ["act-hall", 1, false],
    ]);
    expect(faded(new Set()).every(([, , dimmed]) => dimmed)).toBe(true);
    const all = benchGraph(testBench(), { focusWires: false }).edges;
    expect(all.some((e) => e.data?.dimmed === true)).toBe(false);
  });

  it("tints ports by DPT family", () => {
    // DPT spec §3: the main number is the family (1 = 1 bit, 9 = 2-octet float).
    expect(dptFamily("1.001").key).toBe("bit");
    expect(dptFamily("1.019").key).toBe("bit");
    expect(dptFamily("9.001").key).toBe("float");
    expect(dptFamily("17.001").key).toBe(dptFamily("18.001").key);
    expect(dptFamily("20.105").key).toBe("hvac");
    expect(dptFamily("16.000").key).toBe("text");
  });
});
