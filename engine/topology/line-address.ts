/**
 * Where a line sits in a KNX installation, from its address "area.line"
 * (knx-reference.md, Topology; Basic course): "a.l" with l > 0 is a line,
 * "a.0" the main line of area a, "0.0" the backbone. A line's upper line is the
 * one its coupler joins it to: a line goes to its area's main line, a main line
 * to the backbone. Lines 0.l (l > 0) hang directly under the backbone, whose
 * main line it is. Addresses here are the line's high byte: area << 4 | line.
 */

export type LineKind = "line" | "main" | "backbone";

/** Up to 15 lines per area and 15 areas (Basic course, knx-reference.md Topology). */
export const MAX_LINES_PER_AREA = 15;
export const MAX_AREAS = 15;

export const areaOf = (lineAddress: number): number => lineAddress >> 4;
export const lineNumberOf = (lineAddress: number): number => lineAddress & 15;

export function lineKind(lineAddress: number): LineKind {
  if (lineAddress === 0) return "backbone";
  return lineNumberOf(lineAddress) === 0 ? "main" : "line";
}

/** The line above `lineAddress`, or undefined for the backbone. */
export function upperLineAddress(lineAddress: number): number | undefined {
  if (lineAddress === 0) return undefined;
  if (lineNumberOf(lineAddress) !== 0) return lineAddress & 0xf0;
  return 0;
}

/**
 * The high byte of a line address as a bench writes it ("1.2" -> 0x12). The
 * bench schema and loader have already checked the text ("area.line", both
 * 0..15); this only reads it.
 */
export function parseLineAddress(text: string): number {
  const [area = 0, line = 0] = text.split(".").map(Number);
  return (area << 4) | line;
}

/** "1.2" for the high byte 0x12. */
export function formatLineAddress(lineAddress: number): string {
  return `${areaOf(lineAddress)}.${lineNumberOf(lineAddress)}`;
}

/**
 * The two lines a coupler with this individual address joins: its own line
 * (the lower one, "a.l" for a line coupler a.l.0, "a.0" for an area coupler
 * a.0.0) and the line above. Undefined unless the device part is 0 and the
 * address is not 0.0.0 (knx-reference.md, Topology: line coupler a.l.0,
 * area coupler a.0.0).
 */
export function couplerLines(
  individualAddress: number,
): { readonly lower: number; readonly upper: number; readonly kind: "line" | "area" } | undefined {
  if ((individualAddress & 0xff) !== 0) return undefined;
  const lower = individualAddress >> 8;
  const upper = upperLineAddress(lower);
  if (upper === undefined) return undefined;
  return { lower, upper, kind: lineKind(lower) === "main" ? "area" : "line" };
}

/** True when `lineAddress` is `ancestor` or lies below it (in its subtree). */
export function isWithin(lineAddress: number, ancestor: number): boolean {
  let current: number | undefined = lineAddress;
  while (current !== undefined) {
    if (current === ancestor) return true;
    current = upperLineAddress(current);
  }
  return false;
}

/**
 * The couplers a telegram crosses from line `from` to line `to`, each named
 * by the lower line it couples and the direction it is crossed in: up to the
 * common ancestor, then down. Empty when from === to.
 */
export function linePath(
  from: number,
  to: number,
): readonly { readonly lower: number; readonly direction: "up" | "down" }[] {
  const ancestorsOfFrom: number[] = [];
  for (let c: number | undefined = from; c !== undefined; c = upperLineAddress(c))
    ancestorsOfFrom.push(c);
  const down: number[] = [];
  let meet: number | undefined = to;
  while (meet !== undefined && !ancestorsOfFrom.includes(meet)) {
    down.push(meet);
    meet = upperLineAddress(meet);
  }
  const path: { lower: number; direction: "up" | "down" }[] = [];
  for (const line of ancestorsOfFrom) {
    if (line === meet) break;
    path.push({ lower: line, direction: "up" });
  }
  for (let i = down.length - 1; i >= 0; i--) path.push({ lower: down[i]!, direction: "down" });
  return path;
}
