import type { ElkExtendedEdge, ElkNode } from "elkjs/lib/elk-api";
import { parseGroupAddress, parseIndividualAddress } from "@/engine";
import type { Bench, Position } from "@/engine";
import { deviceObjects } from "@/components/bench-editor/model/device-objects";
import { groupAddressKey } from "@/components/bench-editor/model/group-address-key";
import { drawsLineRegions, isCoupler, stackByLine, type LineRegionBox } from "./line-regions";

/** Card and bus-bar sizes in canvas units; the layout and the nodes share them. */
export const CARD_WIDTH = 248;
export const CARD_HEADER = 52;
export const ROW_HEIGHT = 24;
export const BUS_BAR_WIDTH = 300;
export const BUS_BAR_HEIGHT = 40;
/** Vertical offset of a bus-bar's port: the middle of the bar under its label. */
const BUS_BAR_PORT_Y = 24;
/** Room above a card for its fault chips (live console) and between bars in a group. */
const NODE_GAP = 32;
/** Room between the device column and the bus-bars, where the wires run. */
const WIRE_GAP = 200;
/** Inner margin of an address group frame; the top leaves room for its title. */
export const GROUP_PADDING = { top: 36, side: 16, bottom: 16 } as const;

/** A main/middle group of addresses drawn as a frame around its bus-bars. */
export interface AddressGroupBox {
  /** "1/0": main and middle group. */
  readonly id: string;
  readonly main: number;
  readonly middle: number;
  readonly position: Position;
  readonly width: number;
  readonly height: number;
  /** Keys (raw address) of the bus-bars inside. */
  readonly addresses: readonly string[];
}

/** Where every node would go by itself; a stored position wins over it (see benchGraph). */
export interface BenchLayout {
  readonly devices: ReadonlyMap<string, Position>;
  readonly addresses: ReadonlyMap<string, Position>;
  readonly groups: readonly AddressGroupBox[];
  /**
   * Per link ("device#object@raw address"), the x of the vertical run ELK's
   * orthogonal routing gave it, so wires take separate channels in the gap
   * instead of all turning at the midpoint.
   */
  readonly channels: ReadonlyMap<string, number>;
  /** Line regions top to bottom, when the bench has more than one line (or a coupler). */
  readonly lines: readonly LineRegionBox[];
}

export const EMPTY_LAYOUT: BenchLayout = {
  devices: new Map(),
  addresses: new Map(),
  groups: [],
  channels: new Map(),
  lines: [],
};

/** The subset of elkjs's API the layout needs, so tests and benchmarks can pass their own instance. */
export interface ElkLike {
  layout(graph: ElkNode): Promise<ElkNode>;
}

/** Height of a device card with its object rows (the card's border adds 2). */
export function cardHeight(objectCount: number): number {
  return CARD_HEADER + Math.max(1, objectCount) * ROW_HEIGHT + 2;
}

/** Main/middle group of an address text, or undefined when it does not parse. */
function middleGroupOf(address: string): { main: number; middle: number } | undefined {
  const raw = parseGroupAddress(address);
  if (!raw.ok) return undefined;
  return { main: raw.value >>> 11, middle: (raw.value >>> 8) & 7 };
}

/** Sort key of a device: its individual address, devices on a unit link only last. */
function deviceOrder(address: string | undefined): number {
  if (address === undefined) return Number.MAX_SAFE_INTEGER;
  const raw = parseIndividualAddress(address);
  return raw.ok ? raw.value : Number.MAX_SAFE_INTEGER - 1;
}

/**
 * The devices drawn as cards, in the order both layouts place them: by
 * individual address, bench order among equals. Couplers are left out: they
 * sit on the border between two line regions, placed after the layout.
 */
function cardsInAddressOrder(bench: Bench): Bench["devices"] {
  return bench.devices
    .map((device, index) => ({ device, index }))
    .filter(({ device }) => !isCoupler(device))
    .sort(
      (a, b) =>
        deviceOrder(a.device.individualAddress) - deviceOrder(b.device.individualAddress) ||
        a.index - b.index,
    )
    .map(({ device }) => device);
}

/** A bus-bar to place: its group address key, main/middle group and group frame. */
interface PlacedBusBar {
  readonly key: string;
  readonly group: ReturnType<typeof middleGroupOf>;
  readonly frameId: string;
}

/**
 * The bus-bars in the order both layouts stack them: one per group address
 * (by its key), by raw address, those that do not parse first; each with the
 * main/middle group whose frame it sits in and that frame's id ("?" when the
 * address does not parse).
 */
function busBarsInAddressOrder(bench: Bench): PlacedBusBar[] {
  const bars = new Map<string, PlacedBusBar>();
  const sorted = bench.groupAddresses
    .map((g) => ({ g, raw: parseGroupAddress(g.address) }))
    .sort((a, b) => (a.raw.ok ? a.raw.value : -1) - (b.raw.ok ? b.raw.value : -1));
  for (const { g } of sorted) {
    const key = groupAddressKey(g.address);
    if (bars.has(key)) continue;
    const group = middleGroupOf(g.address);
    bars.set(key, {
      key,
      group,
      frameId: group === undefined ? "?" : `${group.main}/${group.middle}`,
    });
  }
  return [...bars.values()];
}

/** Above this many cards and bars the layout trades some crossing reduction for time. */
const LARGE_BENCH_NODES = 400;

const ROOT_OPTIONS = {
  "elk.algorithm": "layered",
  "elk.direction": "RIGHT",
  // Wires run in right angles in the gap; crossings are minimised by ordering cards and bars.
  "elk.edgeRouting": "ORTHOGONAL",
  "elk.hierarchyHandling": "INCLUDE_CHILDREN",
  "elk.layered.crossingMinimization.strategy": "LAYER_SWEEP",
  "elk.layered.nodePlacement.strategy": "BRANDES_KOEPF",
  // One drawing, not a strip of components: an unlinked bar still sits in its group.
  "elk.separateConnectedComponents": "false",
  "elk.spacing.nodeNode": String(NODE_GAP),
  "elk.layered.spacing.nodeNodeBetweenLayers": String(WIRE_GAP),
  "elk.spacing.edgeEdge": "6",
  "elk.layered.spacing.edgeNodeBetweenLayers": "12",
} as const;

const GROUP_OPTIONS = {
  "elk.padding": `[top=${GROUP_PADDING.top},left=${GROUP_PADDING.side},bottom=${GROUP_PADDING.bottom},right=${GROUP_PADDING.side}]`,
  "elk.spacing.nodeNode": "12",
} as const;

/**
 * The bench as an ELK graph: device cards with one port per group object on
 * the right (in row order, which the card fixes), bus-bars with one port on
 * the left, and bus-bars nested in a frame per main/middle group so a group's
 * bars stay together. Every node takes part, stored position or not, so
 * dragging one card (which stores its position) never moves the others.
 * Unit links stay out, so every card lands in the first layer and every bar
 * in the second. Pure: the same bench gives the same graph.
 */
export function benchElkGraph(bench: Bench): ElkNode {
  const children: ElkNode[] = [];
  const edges: ElkExtendedEdge[] = [];
  const ports = new Set<string>();
  const cards = cardsInAddressOrder(bench);
  for (const device of cards) {
    const objects = deviceObjects(device);
    for (const object of objects) ports.add(`d:${device.id}#${object.number}`);
    children.push({
      id: `d:${device.id}`,
      width: CARD_WIDTH,
      height: cardHeight(objects.length),
      layoutOptions: { "elk.portConstraints": "FIXED_POS" },
      ports: objects.map((object, row) => ({
        id: `d:${device.id}#${object.number}`,
        x: CARD_WIDTH,
        y: CARD_HEADER + row * ROW_HEIGHT + ROW_HEIGHT / 2,
        width: 1,
        height: 1,
        layoutOptions: { "elk.port.side": "EAST" },
      })),
    });
  }

  const groups = new Map<string, ElkNode>();
  const placedAddresses = new Map<string, string>();
  for (const { key, frameId: groupId } of busBarsInAddressOrder(bench)) {
    const bar: ElkNode = {
      id: `g:${key}`,
      width: BUS_BAR_WIDTH,
      height: BUS_BAR_HEIGHT,
      layoutOptions: { "elk.portConstraints": "FIXED_POS" },
      ports: [
        {
          id: `g:${key}#bus`,
          x: 0,
          y: BUS_BAR_PORT_Y,
          width: 1,
          height: 1,
          layoutOptions: { "elk.port.side": "WEST" },
        },
      ],
    };
    let frame = groups.get(groupId);
    if (frame === undefined) {
      frame = { id: `mg:${groupId}`, layoutOptions: { ...GROUP_OPTIONS }, children: [] };
      groups.set(groupId, frame);
      children.push(frame);
    }
    frame.children!.push(bar);
    placedAddresses.set(key, groupId);
  }

  const seen = new Set<string>();
  for (const link of bench.links) {
    const key = groupAddressKey(link.groupAddress);
    const port = `d:${link.device}#${link.object}`;
    // A link to a missing object or address is a check finding, not a wire to lay out.
    if (!ports.has(port) || !placedAddresses.has(key)) continue;
    const id = `${link.device}#${link.object}@${key}`;
    if (seen.has(id)) continue;
    seen.add(id);
    edges.push({
      id,
      sources: [port],
      targets: [`g:${key}#bus`],
    });
  }
  const nodeCount = cards.length + bench.groupAddresses.length;
  return {
    id: "bench",
    layoutOptions: {
      ...ROOT_OPTIONS,
      // Fewer crossing-minimisation sweeps on big benches: about half the time, nearly the same drawing.
      "elk.layered.thoroughness": nodeCount > LARGE_BENCH_NODES ? "1" : "7",
    },
    children,
    edges,
  };
}

/** Reads ELK's answer back into canvas positions; children of a group frame are relative to it. */
export function positionsFromElk(laidOut: ElkNode): BenchLayout {
  const devices = new Map<string, Position>();
  const addresses = new Map<string, Position>();
  const groups: AddressGroupBox[] = [];
  for (const child of laidOut.children ?? []) {
    const x = child.x ?? 0;
    const y = child.y ?? 0;
    if (child.id.startsWith("d:")) {
      devices.set(child.id.slice(2), { x, y });
    } else if (child.id.startsWith("mg:")) {
      const keys: string[] = [];
      for (const bar of child.children ?? []) {
        const key = bar.id.slice(2);
        keys.push(key);
        addresses.set(key, { x: x + (bar.x ?? 0), y: y + (bar.y ?? 0) });
      }
      const id = child.id.slice(3);
      const [main, middle] = id.split("/").map(Number);
      groups.push({
        id,
        main: main ?? Number.NaN,
        middle: middle ?? Number.NaN,
        position: { x, y },
        width: child.width ?? 0,
        height: child.height ?? 0,
        addresses: keys,
      });
    }
  }
  const channels = new Map<string, number>();
  for (const edge of laidOut.edges ?? []) {
    const bend = edge.sections?.[0]?.bendPoints?.[0];
    if (bend !== undefined) channels.set(edge.id, bend.x);
  }
  return { devices, addresses, groups, channels, lines: [] };
}

/**
 * Above this many cards and bars ELK's layered layout takes seconds (a
 * 1,000-device building: about 8 s here, npm run bench:canvas), so the bench
 * is laid out directly instead (directLayout): the same columns and frames,
 * without ELK's crossing minimisation.
 */
export const DIRECT_LAYOUT_NODES = 1500;

/** Whether the bench is laid out by ELK (one line, not too big), so a page knows to load elkjs. */
export function needsElk(bench: Bench): boolean {
  return (
    !drawsLineRegions(bench) &&
    bench.devices.length + bench.groupAddresses.length <= DIRECT_LAYOUT_NODES
  );
}

/**
 * Lays the bench out: ELK's layered algorithm for a bench of one line, the
 * direct layout for a topology (its lines drawn as a tree of regions, which
 * ELK's two columns cannot express) or a bench too big for ELK. Async: elkjs
 * runs its own event loop.
 */
export async function layoutBench(bench: Bench, elk: ElkLike): Promise<BenchLayout> {
  if (!needsElk(bench)) return directLayout(bench);
  const graph = benchElkGraph(bench);
  if ((graph.children ?? []).length === 0) return EMPTY_LAYOUT;
  return positionsFromElk(await elk.layout(graph));
}

/** The layout with its device column restacked line by line (line-regions.ts). */
export function withLineRegions(bench: Bench, layout: BenchLayout): BenchLayout {
  const cards = bench.devices
    .filter((device) => layout.devices.has(device.id))
    .map((device) => ({
      id: device.id,
      position: layout.devices.get(device.id)!,
      width: CARD_WIDTH,
      height: cardHeight(deviceObjects(device).length),
    }));
  const { positions, regions } = stackByLine(bench, cards);
  return { ...layout, devices: positions, lines: regions };
}

/**
 * The layout without ELK, for a topology or a bench too big for ELK in the
 * time a person waits: cards by individual address, in one column or, on a
 * bench with several lines, in a tree of line regions (stackByLine); bus-bars
 * in a column right of them in their main/middle group frames, the frames
 * ordered by where the cards they wire to sit (their mean y), so most wires
 * run across rather than up and down the whole drawing, each bar's wires in a
 * channel of their own in the gap. Linear apart from the sorts.
 */
export function directLayout(bench: Bench): BenchLayout {
  const devices = new Map<string, Position>();
  let y = 0;
  for (const device of cardsInAddressOrder(bench)) {
    devices.set(device.id, { x: 0, y });
    y += cardHeight(deviceObjects(device).length) + NODE_GAP;
  }
  const stacked = drawsLineRegions(bench)
    ? withLineRegions(bench, { ...EMPTY_LAYOUT, devices })
    : { ...EMPTY_LAYOUT, devices };

  // Each frame's bars, by address; each frame's weight: the mean y of the cards wired to it.
  const frames = new Map<
    string,
    { main: number; middle: number; keys: string[]; sumY: number; n: number }
  >();
  const frameOfKey = new Map<string, string>();
  for (const { key, group, frameId: id } of busBarsInAddressOrder(bench)) {
    let frame = frames.get(id);
    if (frame === undefined) {
      frame = {
        main: group?.main ?? Number.NaN,
        middle: group?.middle ?? Number.NaN,
        keys: [],
        sumY: 0,
        n: 0,
      };
      frames.set(id, frame);
    }
    frame.keys.push(key);
    frameOfKey.set(key, id);
  }
  for (const link of bench.links) {
    const frame = frames.get(frameOfKey.get(groupAddressKey(link.groupAddress)) ?? "");
    const card = stacked.devices.get(link.device);
    if (frame === undefined || card === undefined) continue;
    frame.sumY += card.y;
    frame.n += 1;
  }
  const ordered = [...frames.entries()].sort(
    ([, a], [, b]) => (a.n === 0 ? Infinity : a.sumY / a.n) - (b.n === 0 ? Infinity : b.sumY / b.n),
  );
  const addresses = new Map<string, Position>();
  const groups: AddressGroupBox[] = [];
  // Right of every card and region; the wires run down the gap in channels a few units apart.
  const right = Math.max(
    CARD_WIDTH,
    ...stacked.lines.map((r) => r.position.x + r.width),
    ...[...stacked.devices.values()].map((p) => p.x + CARD_WIDTH),
  );
  const barX = right + WIRE_GAP;
  let top = Math.min(0, ...[...stacked.devices.values()].map((p) => p.y));
  for (const [id, frame] of ordered) {
    const height =
      GROUP_PADDING.top + frame.keys.length * (BUS_BAR_HEIGHT + 12) - 12 + GROUP_PADDING.bottom;
    frame.keys.forEach((key, i) =>
      addresses.set(key, {
        x: barX + GROUP_PADDING.side,
        y: top + GROUP_PADDING.top + i * (BUS_BAR_HEIGHT + 12),
      }),
    );
    groups.push({
      id,
      main: frame.main,
      middle: frame.middle,
      position: { x: barX, y: top },
      width: BUS_BAR_WIDTH + 2 * GROUP_PADDING.side,
      height,
      addresses: frame.keys,
    });
    top += height + NODE_GAP;
  }
  // One channel per bus-bar (its wires merge into it anyway), spread across the gap.
  const channels = new Map<string, number>();
  const rank = new Map([...addresses.keys()].map((key, i) => [key, i]));
  const lanes = Math.max(1, Math.floor((WIRE_GAP - 2 * CHANNEL_MARGIN) / CHANNEL_STEP));
  for (const link of bench.links) {
    const key = groupAddressKey(link.groupAddress);
    const i = rank.get(key);
    if (i === undefined) continue;
    channels.set(
      `${link.device}#${link.object}@${key}`,
      right + CHANNEL_MARGIN + (i % lanes) * CHANNEL_STEP,
    );
  }
  return { ...stacked, addresses, groups, channels };
}

/** Room between the cards and the first wire channel, and between two channels. */
const CHANNEL_MARGIN = 16;
const CHANNEL_STEP = 4;

/**
 * When the layout runs again: when a card or bus-bar is added or removed, or
 * a card's size changes. Not on a new link, a rename or a drag: wiring a port
 * must not move the bar it was dropped on, so links are read only when the
 * nodes change (and when the canvas opens).
 */
export function layoutSignature(bench: Bench): string {
  const devices = bench.devices.map(
    (d) => `${d.id}:${d.individualAddress ?? ""}:${d.line ?? ""}:${deviceObjects(d).length}`,
  );
  const addresses = bench.groupAddresses.map((g) => groupAddressKey(g.address));
  const lines = bench.lines.map((l) => `${l.id}:${l.address}`);
  return JSON.stringify([devices, addresses, lines]);
}
