import { COUPLER_TYPE_ID, areaOf, lineNumberOf, parseIndividualAddress } from "@/engine";
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

/** Level of a line in the topology tree: backbone 0, main lines (and 0.l) 1, lines 2. */
function levelOf(line: BenchLine): number {
  const address = lineHighByte(line);
  if (areaOf(address) === 0) return lineNumberOf(address) === 0 ? 0 : 1;
  return lineNumberOf(address) === 0 ? 1 : 2;
}

/** The parent of a line in the drawn tree: the line above it when the bench has it. */
function parentOf(bench: Bench, line: BenchLine): BenchLine | undefined {
  const [area = 0, number = 0] = line.address.split(".").map(Number);
  const upper = area === 0 && number === 0 ? undefined : number === 0 ? "0.0" : `${area}.0`;
  return upper === undefined ? undefined : bench.lines.find((l) => l.address === upper);
}

/**
 * Lays the lines out as the topology they are: the backbone on top, each
 * area's main line below it, an area's lines side by side under their main
 * line, each line a region holding its cards in a column (in the order given,
 * the cards' y). A coupler sits on its line's top border, so it leads up to
 * the region it joins. Lines whose line above is not on the bench start a tree
 * of their own, left to right by address. Couplers are left out of `cards`.
 */
export function stackByLine(
  bench: Bench,
  cards: readonly CardBox[],
): { positions: Map<string, Position>; regions: LineRegionBox[] } {
  const lineOf = deviceLines(bench);
  const byLine = new Map<string, CardBox[]>();
  for (const card of cards) {
    const line = lineOf.get(card.id);
    if (line === undefined) continue;
    const list = byLine.get(line) ?? [];
    list.push(card);
    byLine.set(line, list);
  }
  const lines = orderedLines(bench);
  const children = new Map<string, BenchLine[]>();
  const roots: BenchLine[] = [];
  for (const line of lines) {
    const parent = parentOf(bench, line);
    if (parent === undefined) roots.push(line);
    else children.set(parent.id, [...(children.get(parent.id) ?? []), line]);
  }
  const columnWidth = (line: BenchLine) =>
    Math.max(COUPLER_WIDTH, ...(byLine.get(line.id) ?? []).map((card) => card.width)) +
    2 * LINE_PADDING.side;
  const columnHeight = (line: BenchLine) => {
    const own = byLine.get(line.id) ?? [];
    const inner =
      own.length === 0
        ? COUPLER_HEIGHT
        : own.reduce((sum, card) => sum + card.height, 0) + (own.length - 1) * CARD_GAP;
    return LINE_PADDING.top + inner + LINE_PADDING.bottom;
  };
  // Width of each subtree, so children sit side by side under their parent.
  const span = new Map<string, number>();
  const spanOf = (line: BenchLine): number => {
    const kids = children.get(line.id) ?? [];
    const below =
      kids.reduce((sum, kid) => sum + spanOf(kid), 0) + Math.max(0, kids.length - 1) * LINE_GAP;
    const width = Math.max(columnWidth(line), below);
    span.set(line.id, width);
    return width;
  };
  // One row per level: a row starts below the tallest region of the row above.
  const levels = [...new Set(lines.map(levelOf))].sort((a, b) => a - b);
  const rowHeight = new Map<number, number>();
  for (const line of lines)
    rowHeight.set(levelOf(line), Math.max(rowHeight.get(levelOf(line)) ?? 0, columnHeight(line)));
  const rowTop = new Map<number, number>();
  let y = 0;
  for (const level of levels) {
    rowTop.set(level, y);
    y += (rowHeight.get(level) ?? 0) + LINE_GAP;
  }

  const positions = new Map<string, Position>();
  const regions: LineRegionBox[] = [];
  const place = (line: BenchLine, x: number) => {
    const top = rowTop.get(levelOf(line)) ?? 0;
    const width = span.get(line.id) ?? columnWidth(line);
    regions.push({ lineId: line.id, position: { x, y: top }, width, height: columnHeight(line) });
    let cardY = top + LINE_PADDING.top;
    for (const card of (byLine.get(line.id) ?? []).sort((a, b) => a.position.y - b.position.y)) {
      positions.set(card.id, { x: x + LINE_PADDING.side, y: cardY });
      cardY += card.height + CARD_GAP;
    }
    let childX = x;
    for (const kid of children.get(line.id) ?? []) {
      place(kid, childX);
      childX += (span.get(kid.id) ?? 0) + LINE_GAP;
    }
  };
  let x = 0;
  for (const root of roots) {
    spanOf(root);
    place(root, x);
    x += (span.get(root.id) ?? 0) + LINE_GAP;
  }
  regions.sort(
    (a, b) => lines.findIndex((l) => l.id === a.lineId) - lines.findIndex((l) => l.id === b.lineId),
  );
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
    // The laid-out box (a main line spans the lines under it), grown to any card dragged out.
    const kept = fallback.get(line.id);
    const minX = Math.min(box.minX - LINE_PADDING.side, kept?.position.x ?? Infinity);
    const minY = Math.min(box.minY - LINE_PADDING.top, kept?.position.y ?? Infinity);
    const maxX = Math.max(
      box.maxX + LINE_PADDING.side,
      minX + COUPLER_WIDTH + 2 * LINE_PADDING.side,
      kept === undefined ? -Infinity : kept.position.x + kept.width,
    );
    const maxY = Math.max(
      box.maxY + LINE_PADDING.bottom,
      kept === undefined ? -Infinity : kept.position.y + kept.height,
    );
    regions.push({
      lineId: line.id,
      position: { x: minX, y: minY },
      width: maxX - minX,
      height: maxY - minY,
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
