import { COUPLER_TYPE_ID, parseIndividualAddress } from "@/engine";
import type { Bench, BenchDevice, BenchLine, Position } from "@/engine";
import { lineHighByte } from "@/components/bench-editor/model/individual-addresses";

/** Catalogue type id of couplers (topology contract): drawn on a line's top border, not in its column. */
export const COUPLER_TYPE = COUPLER_TYPE_ID;

/** Inner margin of a line region; the top leaves room for its title and the lower half of its coupler. */
export const LINE_PADDING = { top: 40, side: 16, bottom: 16 } as const;
/** Room between two line regions, where the upper half of a coupler sits. */
export const LINE_GAP = 48;
/** A coupler's badge on the boundary between a line and the line above. */
export const COUPLER_WIDTH = 168;
export const COUPLER_HEIGHT = 40;
/** Room between two cards of one line's column (as the layout's node gap). */
const CARD_GAP = 32;

export function isCoupler(device: BenchDevice): boolean {
  return device.type === COUPLER_TYPE;
}

/** "0.0" < "1.0" < "1.1" < "2.0": backbone, then each area's main line followed by its lines. */
export function lineOrder(line: BenchLine): number {
  return lineHighByte(line);
}

/** Lines top to bottom, as the canvas stacks them. */
export function orderedLines(bench: Bench): BenchLine[] {
  return bench.lines
    .map((line, index) => ({ line, index }))
    .sort((a, b) => lineOrder(a.line) - lineOrder(b.line) || a.index - b.index)
    .map(({ line }) => line);
}

/**
 * The line a device is drawn in: its `line`, else the line its individual
 * address belongs to, else (a device only on a unit link: an indoor unit, a
 * wall controller) the line of a unit-link partner, else the first line.
 */
export function deviceLines(bench: Bench): Map<string, string> {
  const byHigh = new Map(bench.lines.map((line) => [lineHighByte(line), line.id]));
  const ids = new Set(bench.lines.map((line) => line.id));
  const result = new Map<string, string>();
  for (const device of bench.devices) {
    if (device.line !== undefined && ids.has(device.line)) {
      result.set(device.id, device.line);
      continue;
    }
    if (device.individualAddress === undefined) continue;
    const raw = parseIndividualAddress(device.individualAddress);
    const line = raw.ok ? byHigh.get(raw.value >>> 8) : undefined;
    if (line !== undefined) result.set(device.id, line);
  }
  // Unit-link members follow a partner that has a line; repeated so a chain settles.
  for (let pass = 0; pass < 2; pass++) {
    for (const unitLink of bench.unitLinks) {
      const known = unitLink.members.map((m) => result.get(m)).find((l) => l !== undefined);
      if (known === undefined) continue;
      for (const member of unitLink.members) if (!result.has(member)) result.set(member, known);
    }
  }
  const first = orderedLines(bench)[0]?.id;
  if (first !== undefined)
    for (const device of bench.devices) if (!result.has(device.id)) result.set(device.id, first);
  return result;
}

/** Whether the canvas draws line regions: a bench of one line is the whole canvas. */
export function drawsLineRegions(bench: Bench): boolean {
  return bench.lines.length > 1 || bench.devices.some(isCoupler);
}

/** A line drawn as a region of the canvas around its devices' cards. */
export interface LineRegionBox {
  readonly lineId: string;
  readonly position: Position;
  readonly width: number;
  readonly height: number;
}

export interface CardBox {
  readonly id: string;
  readonly position: Position;
  readonly width: number;
  readonly height: number;
}

/**
 * Restacks the device column the layered layout produced so each line's cards
 * are together, lines top to bottom in `orderedLines` order, with room for a
 * region frame and a coupler between them. Keeps every card's x and the
 * layout's order of cards within a line, so wires still reach the same bars.
 * Couplers are left out: they sit on a region's border (couplerPosition).
 */
export function stackByLine(
  bench: Bench,
  cards: readonly CardBox[],
): { positions: Map<string, Position>; regions: LineRegionBox[] } {
  const lineOf = deviceLines(bench);
  const byLine = new Map<string, CardBox[]>();
  let minX = Infinity;
  let minY = Infinity;
  let maxRight = -Infinity;
  for (const card of cards) {
    const line = lineOf.get(card.id);
    if (line === undefined) continue;
    const list = byLine.get(line) ?? [];
    list.push(card);
    byLine.set(line, list);
    minX = Math.min(minX, card.position.x);
    minY = Math.min(minY, card.position.y);
    maxRight = Math.max(maxRight, card.position.x + card.width);
  }
  const positions = new Map<string, Position>();
  const regions: LineRegionBox[] = [];
  if (minX === Infinity) {
    minX = 0;
    minY = 0;
    maxRight = 0;
  }
  // The first region's title and coupler need room above the first card.
  let cursor = minY - LINE_PADDING.top + LINE_GAP;
  for (const line of orderedLines(bench)) {
    const own = (byLine.get(line.id) ?? []).sort((a, b) => a.position.y - b.position.y);
    const top = cursor;
    let y = top + LINE_PADDING.top;
    for (const card of own) {
      positions.set(card.id, { x: card.position.x, y });
      y += card.height + CARD_GAP;
    }
    const inner = own.length === 0 ? COUPLER_HEIGHT : y - CARD_GAP - (top + LINE_PADDING.top);
    const height = LINE_PADDING.top + inner + LINE_PADDING.bottom;
    regions.push({
      lineId: line.id,
      position: { x: minX - LINE_PADDING.side, y: top },
      width: Math.max(maxRight - minX, COUPLER_WIDTH) + 2 * LINE_PADDING.side,
      height,
    });
    cursor = top + height + LINE_GAP;
  }
  return { positions, regions };
}

/**
 * Regions around where each line's cards actually are (a dragged card takes
 * its region along), in line order; a line with no cards keeps its laid-out box.
 */
export function regionsAround(
  bench: Bench,
  cards: readonly CardBox[],
  laidOut: readonly LineRegionBox[],
): LineRegionBox[] {
  const lineOf = deviceLines(bench);
  const boxes = new Map<string, { minX: number; minY: number; maxX: number; maxY: number }>();
  for (const card of cards) {
    const line = lineOf.get(card.id);
    if (line === undefined) continue;
    const box = boxes.get(line) ?? {
      minX: Infinity,
      minY: Infinity,
      maxX: -Infinity,
      maxY: -Infinity,
    };
    box.minX = Math.min(box.minX, card.position.x);
    box.minY = Math.min(box.minY, card.position.y);
    box.maxX = Math.max(box.maxX, card.position.x + card.width);
    box.maxY = Math.max(box.maxY, card.position.y + card.height);
    boxes.set(line, box);
  }
  const fallback = new Map(laidOut.map((r) => [r.lineId, r]));
  const regions: LineRegionBox[] = [];
  for (const line of orderedLines(bench)) {
    const box = boxes.get(line.id);
    if (box === undefined) {
      const kept = fallback.get(line.id);
      if (kept !== undefined) regions.push(kept);
      continue;
    }
    const width = Math.max(box.maxX - box.minX, COUPLER_WIDTH) + 2 * LINE_PADDING.side;
    regions.push({
      lineId: line.id,
      position: { x: box.minX - LINE_PADDING.side, y: box.minY - LINE_PADDING.top },
      width,
      height: box.maxY - box.minY + LINE_PADDING.top + LINE_PADDING.bottom,
    });
  }
  return regions;
}

/**
 * Where a coupler is drawn: across the top border of its own line's region
 * (a line coupler a.l.0 on line a.l, an area coupler a.0.0 on main line a.0),
 * the boundary with the line above, at the region's right.
 */
export function couplerPosition(region: LineRegionBox, index = 0): Position {
  return {
    x: region.position.x + region.width - COUPLER_WIDTH - 8 - index * (COUPLER_WIDTH + 8),
    y: region.position.y - COUPLER_HEIGHT / 2,
  };
}
