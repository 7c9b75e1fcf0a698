import { isWithin } from "./line-address";

/**
 * What a coupler does with a telegram, as pure decisions (knx-reference.md,
 * Topology; Basic course, chapter on couplers):
 *
 * - Group telegrams: per coupler "forward" (pass all), "block" (pass none) or
 *   "filter" (pass what the filter table holds). In "filter", main groups 14
 *   and 15 pass regardless of the table (from memory of the Basic course:
 *   couplers did not filter these main groups, which is why they were kept for
 *   installation-wide functions; no source in knx-reference.md).
 * - Individually addressed telegrams: "route" passes a telegram whose
 *   destination lies on the other side, "forward" passes all, "block" none.
 * - Routing counter (hop count, 3 bits): a coupler passes a telegram on with
 *   the counter decreased by one, and does not pass a telegram whose counter
 *   is 0. A counter of 7 is passed without decrement, so such a telegram is
 *   never stopped by the counter (knx-reference.md, Topology, marked from
 *   memory there). Devices send 6 (knx-reference.md, TP1 standard frame).
 */

export type GroupTelegramMode = "filter" | "forward" | "block";
export type IndividualTelegramMode = "route" | "forward" | "block";
export type CrossingDirection = "up" | "down";

/** Why a coupler did not pass a telegram on. */
export type CouplerDropReason =
  "filter" | "blocked" | "hop-count" | "queue-full" | "not-acknowledged";

/** Main groups a coupler in "filter" mode passes without looking at its table (from memory, see above). */
export const UNFILTERED_MAIN_GROUPS: ReadonlySet<number> = new Set([14, 15]);

/** Routing counter value that is never decremented (knx-reference.md, Topology, from memory). */
export const UNLIMITED_HOP_COUNT = 7;

/** Main group of a raw 16-bit group address (3-level: main 0-31 in the top 5 bits). */
export const mainGroupOf = (groupAddress: number): number => groupAddress >> 11;

/** Whether a group telegram to `groupAddress` passes a coupler with this mode and table. */
export function groupPasses(
  mode: GroupTelegramMode,
  filterTable: ReadonlySet<number>,
  groupAddress: number,
): "pass" | "filter" | "blocked" {
  if (mode === "forward") return "pass";
  if (mode === "block") return "blocked";
  if (UNFILTERED_MAIN_GROUPS.has(mainGroupOf(groupAddress))) return "pass";
  return filterTable.has(groupAddress) ? "pass" : "filter";
}

/**
 * Whether an individually addressed telegram to `destination` heard on one
 * side of a coupler passes to the other. `lowerLine` is the coupler's own line
 * (high byte area << 4 | line); its side "below" is every line within it.
 */
export function individualPasses(
  mode: IndividualTelegramMode,
  lowerLine: number,
  direction: CrossingDirection,
  destination: number,
): "pass" | "filter" | "blocked" {
  if (mode === "forward") return "pass";
  if (mode === "block") return "blocked";
  const below = isWithin(destination >> 8, lowerLine);
  return (direction === "down") === below ? "pass" : "filter";
}

/** The routing counter on the far side, or undefined when the telegram must not pass (counter 0). */
export function nextHopCount(hopCount: number): number | undefined {
  if (hopCount === UNLIMITED_HOP_COUNT) return UNLIMITED_HOP_COUNT;
  if (hopCount <= 0) return undefined;
  return hopCount - 1;
}
