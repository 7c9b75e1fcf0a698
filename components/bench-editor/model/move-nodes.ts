import type { Bench, Position } from "@/engine";
import { groupAddressKey } from "./group-address-key";

/** A node on the canvas: a device card or a group address bus-bar. */
export type NodeRef =
  | { readonly kind: "device"; readonly id: string }
  | { readonly kind: "group-address"; readonly address: string };

export interface NodeMove {
  readonly node: NodeRef;
  readonly position: Position;
}

/** Stores canvas positions (rounded to whole canvas units so files stay tidy). */
export function moveNodes(bench: Bench, moves: readonly NodeMove[]): Bench {
  const devices = new Map<string, Position>();
  const addresses = new Map<string, Position>();
  for (const move of moves) {
    const position = { x: Math.round(move.position.x), y: Math.round(move.position.y) };
    if (move.node.kind === "device") devices.set(move.node.id, position);
    else addresses.set(groupAddressKey(move.node.address), position);
  }
  return {
    ...bench,
    devices:
      devices.size === 0
        ? bench.devices
        : bench.devices.map((d) =>
            devices.has(d.id) ? { ...d, position: devices.get(d.id)! } : d,
          ),
    groupAddresses:
      addresses.size === 0
        ? bench.groupAddresses
        : bench.groupAddresses.map((g) => {
            const position = addresses.get(groupAddressKey(g.address));
            return position === undefined ? g : { ...g, position };
          }),
  };
}
