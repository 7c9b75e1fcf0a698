import type { AddressUse } from "./address-use";
import { isWithin } from "./line-address";

/**
 * The filter table a coupler needs, generated from the links as commissioning
 * would. Our rule: a coupler passes a group address when a telegram on it must
 * cross the coupler, that is when the address has a sender on one side and a
 * listener on the other (side "below" = the coupler's own line and, for an
 * area coupler, every line of its area; "above" = everything else). So a line
 * coupler passes an address upward when someone outside its line listens to a
 * sender inside, and downward when someone inside listens to a sender outside;
 * one table serves both directions, as on a real coupler.
 *
 * Source: the coupler's job as the Basic course describes it (knx-reference.md,
 * Topology: couplers pass group telegrams by filter table), which is to keep a
 * line's own traffic off the rest of the installation; commissioning software
 * likewise leaves addresses used only inside a line out of its coupler's table
 * (common practice, no published source). The test tool is not a member: like
 * a diagnostic interface plugged into one line, it reaches other lines only on
 * addresses that cross anyway, and a write it sends that a coupler filters is
 * traced as coupler.drop "filter" when someone beyond listens.
 */
export function generatedFilterTable(
  uses: ReadonlyMap<number, AddressUse>,
  lowerLine: number,
): number[] {
  const table: number[] = [];
  for (const [groupAddress, use] of uses) {
    if (mustCross(use, lowerLine)) table.push(groupAddress);
  }
  return table.sort((a, b) => a - b);
}

/** True when a sender on one side of the coupler of `lowerLine` has a listener on the other side. */
export function mustCross(use: AddressUse, lowerLine: number): boolean {
  let senderBelow = false;
  let senderAbove = false;
  for (const line of use.senders) {
    if (isWithin(line, lowerLine)) senderBelow = true;
    else senderAbove = true;
  }
  if (!senderBelow && !senderAbove) return false;
  for (const line of use.listeners) {
    const below = isWithin(line, lowerLine);
    if ((below && senderAbove) || (!below && senderBelow)) return true;
  }
  return false;
}
