import ELK from "elkjs/lib/elk.bundled.js";
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { benchSchema, type Bench } from "@/engine";
import { parseGroupAddress } from "@/engine";
import { testBench } from "@/components/bench-editor/model/test-bench";
import { moveNodes } from "@/components/bench-editor/model/move-nodes";
import { generateBuilding } from "@/test/bench/building-generator";
import { benchGraph, type BenchNode } from "./bench-graph";
import {
  BUS_BAR_HEIGHT,
  BUS_BAR_WIDTH,
  CARD_WIDTH,
  cardHeight,
  DIRECT_LAYOUT_NODES,
  layoutBench,
  layoutSignature,
} from "./bench-layout";

const elk = new ELK();

function demoBench(): Bench {
  const file = new URL(
    "../../scenarios/benches/fernhill-training-centre.bench.json",
    import.meta.url,
  );
  return benchSchema.parse(JSON.parse(readFileSync(file, "utf8")));
}

interface Rect {
  readonly id: string;
  readonly x: number;
  readonly y: number;
  readonly w: number;
  readonly h: number;
}

function rects(nodes: readonly BenchNode[]): Rect[] {
  return nodes.flatMap((n): Rect[] => {
    if (n.type === "device")
      return [{ id: n.id, ...n.position, w: CARD_WIDTH, h: cardHeight(n.data.objects.length) }];
    if (n.type === "busBar")
      return [{ id: n.id, ...n.position, w: BUS_BAR_WIDTH, h: BUS_BAR_HEIGHT }];
    return [];
  });
}

function overlaps(a: Rect, b: Rect): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

function overlapping(list: readonly Rect[]): string[] {
  const found: string[] = [];
  for (let i = 0; i < list.length; i++)
    for (let j = i + 1; j < list.length; j++)
      if (overlaps(list[i]!, list[j]!)) found.push(`${list[i]!.id} × ${list[j]!.id}`);
  return found;
}

/** Main/middle group of a raw address (knx-reference.md, Addresses: raw = main<<11 | middle<<8 | sub). */
function middleGroup(raw: number): string {
  return `${raw >>> 11}/${(raw >>> 8) & 7}`;
}

// elkjs warms its compiled code up on the first layouts; on a busy two-core machine that takes seconds.
describe("layoutBench (elkjs layered)", { timeout: 60_000 }, () => {
  it("lays the demo bench out with no card or bar overlapping another", async () => {
    const bench = demoBench();
    const layout = await layoutBench(bench, elk);
    expect(layout.devices.size).toBe(bench.devices.length);
    expect(layout.addresses.size).toBe(bench.groupAddresses.length);
    const { nodes } = benchGraph(bench, { layout });
    expect(overlapping(rects(nodes))).toEqual([]);
  });

  it("puts every card left of every bus-bar, so wires run one way", async () => {
    const bench = demoBench();
    const layout = await layoutBench(bench, elk);
    const cardsRight = Math.max(...[...layout.devices.values()].map((p) => p.x + CARD_WIDTH));
    const barsLeft = Math.min(...[...layout.addresses.values()].map((p) => p.x));
    expect(cardsRight).toBeLessThan(barsLeft);
  });

  it("groups bus-bars by main and middle group: each group's bars sit together in its frame", async () => {
    const bench = demoBench();
    const layout = await layoutBench(bench, elk);
    const byGroup = new Map<string, string[]>();
    for (const g of bench.groupAddresses) {
      const raw = parseGroupAddress(g.address);
      if (!raw.ok) throw new Error(g.address);
      const id = middleGroup(raw.value);
      byGroup.set(id, [...(byGroup.get(id) ?? []), String(raw.value)]);
    }
    expect(layout.groups.map((g) => g.id).sort()).toEqual([...byGroup.keys()].sort());
    for (const group of layout.groups) {
      expect([...group.addresses].sort()).toEqual([...byGroup.get(group.id)!].sort());
      for (const key of group.addresses) {
        const p = layout.addresses.get(key)!;
        expect(p.x).toBeGreaterThanOrEqual(group.position.x);
        expect(p.y).toBeGreaterThanOrEqual(group.position.y);
        expect(p.x + BUS_BAR_WIDTH).toBeLessThanOrEqual(group.position.x + group.width);
        expect(p.y + BUS_BAR_HEIGHT).toBeLessThanOrEqual(group.position.y + group.height);
      }
    }
    // Frames do not overlap, so no bar of one group sits between bars of another.
    const frames = layout.groups.map((g) => ({ id: g.id, ...g.position, w: g.width, h: g.height }));
    expect(overlapping(frames)).toEqual([]);
  });

  it("routes wires in separate vertical channels between the cards and the bars", async () => {
    const bench = demoBench();
    const layout = await layoutBench(bench, elk);
    const cardsRight = Math.max(...[...layout.devices.values()].map((p) => p.x + CARD_WIDTH));
    const barsLeft = Math.min(...[...layout.addresses.values()].map((p) => p.x));
    const channels = [...layout.channels.values()];
    expect(channels.length).toBeGreaterThan(bench.links.length / 2);
    for (const x of channels) {
      expect(x).toBeGreaterThan(cardsRight);
      expect(x).toBeLessThan(barsLeft);
    }
    // Not one shared midpoint: the router spreads the wires over several channels.
    expect(new Set(channels.map(Math.round)).size).toBeGreaterThan(5);
  });

  it("keeps stored positions, and a drag does not move the other nodes", async () => {
    const bench = testBench();
    const before = benchGraph(bench, { layout: await layoutBench(bench, elk) });
    const moved = moveNodes(bench, [
      { node: { kind: "device", id: "pb-hall" }, position: { x: -500, y: 700 } },
      { node: { kind: "group-address", address: "1/0/2" }, position: { x: 900, y: -60 } },
    ]);
    // Moving stores positions only; the layout does not run again.
    expect(layoutSignature(moved)).toBe(layoutSignature(bench));
    const after = benchGraph(moved, { layout: await layoutBench(moved, elk) });
    const position = (nodes: readonly BenchNode[], id: string) =>
      nodes.find((n) => n.id === id)?.position;
    expect(position(after.nodes, "d:pb-hall")).toEqual({ x: -500, y: 700 });
    expect(position(after.nodes, "g:2050")).toEqual({ x: 900, y: -60 });
    expect(position(after.nodes, "d:act-hall")).toEqual(position(before.nodes, "d:act-hall"));
    expect(position(after.nodes, "g:2049")).toEqual(position(before.nodes, "g:2049"));
  });

  it("lays out again when a node is added, not when a port is wired; an empty bench needs none", async () => {
    const bench = testBench();
    const linked = {
      ...bench,
      links: [...bench.links, { device: "pb-hall", object: 1, groupAddress: "3/1/2" }],
    };
    expect(layoutSignature(linked)).toBe(layoutSignature(bench));
    const grown = {
      ...bench,
      groupAddresses: [...bench.groupAddresses, { address: "3/1/3", name: "More", dpt: "1.001" }],
    };
    expect(layoutSignature(grown)).not.toBe(layoutSignature(bench));
    const empty = { ...bench, devices: [], groupAddresses: [], links: [] };
    const emptyLayout = await layoutBench(empty, {
      layout: () => Promise.reject(new Error("not called")),
    });
    expect(emptyLayout).toMatchObject({
      devices: new Map(),
      addresses: new Map(),
      groups: [],
      channels: new Map(),
    });
    // Its two lines still show, as empty regions to add devices to.
    expect(emptyLayout.lines.map((l) => l.lineId)).toHaveLength(2);
  });
});

describe("directLayout (benches too big for ELK)", () => {
  it("lays a 1,000-device building out without ELK: cards by line left of bars in their frames, nothing overlapping", async () => {
    const bench = benchSchema.parse(generateBuilding({ devices: 1000 }));
    expect(bench.devices.length + bench.groupAddresses.length).toBeGreaterThan(DIRECT_LAYOUT_NODES);
    const layout = await layoutBench(bench, {
      layout: () => Promise.reject(new Error("ELK is not called for a bench this size")),
    });
    const couplers = bench.devices.filter((d) => d.type === "coupler").length;
    expect(layout.devices.size).toBe(bench.devices.length - couplers);
    expect(layout.addresses.size).toBe(bench.groupAddresses.length);
    expect(layout.lines.map((l) => l.lineId)).toHaveLength(bench.lines.length);
    const cardsRight = Math.max(...[...layout.devices.values()].map((p) => p.x + CARD_WIDTH));
    const barsLeft = Math.min(...[...layout.addresses.values()].map((p) => p.x));
    expect(cardsRight).toBeLessThan(barsLeft);
    for (const group of layout.groups)
      for (const key of group.addresses) {
        const p = layout.addresses.get(key)!;
        expect(p.y).toBeGreaterThanOrEqual(group.position.y);
        expect(p.y + BUS_BAR_HEIGHT).toBeLessThanOrEqual(group.position.y + group.height);
      }
    const { nodes } = benchGraph(bench, { layout });
    expect(overlapping(rects(nodes))).toEqual([]);
  });
});
