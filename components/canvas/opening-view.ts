import type { Viewport } from "@xyflow/react";
import { parseIndividualAddress } from "@/engine";
import type { BenchNode } from "./bench-graph";
import { BUS_BAR_HEIGHT, BUS_BAR_WIDTH, CARD_WIDTH, cardHeight } from "./bench-layout";
import { COUPLER_HEIGHT, COUPLER_WIDTH } from "./line-regions";

/**
 * The zoom range a canvas opens at: card titles are 14 px and object rows
 * 11 px at zoom 1, so 0.9 keeps titles at 12.6 px and rows near 10 px
 * (readable on a classroom tablet); above 1 the canvas would waste the room.
 */
export const OPEN_ZOOM_MIN = 0.9;
export const OPEN_ZOOM_MAX = 1;
const PADDING = 32;
/** Top margin when the focus is taller than the canvas: clears the search box over the canvas. */
export const TOP_CLEARANCE = 64;

interface Box {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

function nodeBox(node: BenchNode): Box | undefined {
  let width: number;
  let height: number;
  if (node.type === "device") {
    width = CARD_WIDTH;
    height = cardHeight(node.data.objects.length);
  } else if (node.type === "busBar") {
    width = BUS_BAR_WIDTH;
    height = BUS_BAR_HEIGHT;
  } else if (node.type === "coupler") {
    width = COUPLER_WIDTH;
    height = COUPLER_HEIGHT;
  } else if (node.type === "addressGroup" || node.type === "lineRegion") {
    width = node.data.width;
    height = node.data.height;
  } else return undefined;
  const { x, y } = node.position;
  return { minX: x, minY: y, maxX: x + width, maxY: y + height };
}

function union(boxes: readonly (Box | undefined)[]): Box | undefined {
  let box: Box | undefined;
  for (const b of boxes) {
    if (b === undefined) continue;
    box =
      box === undefined
        ? { ...b }
        : {
            minX: Math.min(box.minX, b.minX),
            minY: Math.min(box.minY, b.minY),
            maxX: Math.max(box.maxX, b.maxX),
            maxY: Math.max(box.maxY, b.maxY),
          };
  }
  return box;
}

/**
 * Line part ("area.line") of a device's individual address, as a sortable
 * number; undefined for a device that sits only on a unit link (an indoor
 * unit, a wall controller), which goes with whichever line is shown.
 */
function lineOf(node: BenchNode): number | undefined {
  if (node.type !== "device" || node.data.device.individualAddress === undefined) return undefined;
  const raw = parseIndividualAddress(node.data.device.individualAddress);
  return raw.ok ? raw.value >>> 8 : Infinity;
}

/**
 * What the canvas opens on, in order: the selection; else the devices with an
 * active fault; else the devices of the first line (lowest area.line); else
 * every node.
 */
export function openingFocus(nodes: readonly BenchNode[]): BenchNode[] {
  const drawn = nodes.filter((n) => n.type === "device" || n.type === "busBar");
  const selected = drawn.filter((n) => n.selected === true);
  if (selected.length > 0) return selected;
  const faulty = drawn.filter((n) => n.type === "device" && n.data.faults !== undefined);
  if (faulty.length > 0) return faulty;
  const devices = drawn.filter((n) => n.type === "device");
  const lines = devices.map(lineOf).filter((line) => line !== undefined);
  const first = Math.min(...lines);
  const firstLine = devices.filter((n) => {
    const line = lineOf(n);
    return line === undefined || line === first;
  });
  return firstLine.length > 0 ? firstLine : drawn;
}

/**
 * The viewport a canvas of `size` pixels opens at: zoomed so card text is
 * readable (OPEN_ZOOM_MIN..OPEN_ZOOM_MAX) and placed on the focus. Across,
 * the whole drawing shows when it fits (cards and the bars they wire to);
 * down, a focus taller than the canvas shows from its top.
 */
export function openingViewport(
  nodes: readonly BenchNode[],
  size: { readonly width: number; readonly height: number },
): Viewport {
  const all = union(nodes.map(nodeBox));
  const focus = union(openingFocus(nodes).map(nodeBox));
  if (all === undefined || focus === undefined || size.width <= 0 || size.height <= 0)
    return { x: 0, y: 0, zoom: OPEN_ZOOM_MAX };
  const box = { ...focus };
  const room = { width: size.width - 2 * PADDING, height: size.height - 2 * PADDING };
  if ((all.maxX - all.minX) * OPEN_ZOOM_MIN <= room.width) {
    box.minX = all.minX;
    box.maxX = all.maxX;
  }
  const fit = Math.min(room.width / (box.maxX - box.minX), room.height / (box.maxY - box.minY));
  const zoom = Math.min(OPEN_ZOOM_MAX, Math.max(OPEN_ZOOM_MIN, fit));
  const place = (min: number, max: number, pixels: number, margin: number) => {
    const span = (max - min) * zoom;
    return span <= pixels - 2 * margin ? (pixels - span) / 2 - min * zoom : margin - min * zoom;
  };
  return {
    x: place(box.minX, box.maxX, size.width, PADDING),
    y: place(box.minY, box.maxY, size.height, TOP_CLEARANCE),
    zoom,
  };
}

/**
 * Where to pan, keeping the zoom, so `nodes` come into view: undefined when
 * they all are already; else centred on them when they fit, or on the top
 * one when they do not (a fault that spans the bench starts where it reads).
 */
export function revealViewport(
  nodes: readonly BenchNode[],
  viewport: Viewport,
  size: { readonly width: number; readonly height: number },
): Viewport | undefined {
  const box = union(nodes.map(nodeBox));
  if (box === undefined) return undefined;
  const { zoom } = viewport;
  const onScreen = (b: Box) =>
    b.minX * zoom + viewport.x >= 0 &&
    b.minY * zoom + viewport.y >= 0 &&
    b.maxX * zoom + viewport.x <= size.width &&
    b.maxY * zoom + viewport.y <= size.height;
  const boxes = nodes.map(nodeBox).filter((b): b is Box => b !== undefined);
  if (boxes.every(onScreen)) return undefined;
  const fits =
    (box.maxX - box.minX) * zoom <= size.width - 2 * PADDING &&
    (box.maxY - box.minY) * zoom <= size.height - 2 * PADDING;
  const target = fits ? box : boxes.reduce((top, b) => (b.minY < top.minY ? b : top));
  return {
    zoom,
    x: size.width / 2 - ((target.minX + target.maxX) / 2) * zoom,
    y: size.height / 2 - ((target.minY + target.maxY) / 2) * zoom,
  };
}
