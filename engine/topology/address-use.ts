import type { GroupObjectFlags } from "../devices/device-type";

/**
 * Which lines send on and listen to each group address: what a filter table
 * and the topology checks are computed from. Lines are their high byte
 * (area << 4 | line).
 *
 * An object sends on an address when it may put a telegram there: its first
 * (sending) link with the communication and transmit flags, or any link with
 * the read flag (it answers reads there). It listens when a telegram there
 * does something to it: the write or update flag, or the read flag (a read must
 * reach it to be answered). These are the flag meanings the group-object layer
 * implements (engine/sim/group-objects.ts).
 */
export interface AddressUse {
  readonly senders: ReadonlySet<number>;
  readonly listeners: ReadonlySet<number>;
}

/** One linked object as the use table needs it. */
export interface LinkedObject {
  readonly flags: GroupObjectFlags;
  /** Raw group addresses in bench order; the first is the sending address. */
  readonly groupAddresses: readonly number[];
}

export function objectSends(object: LinkedObject, groupAddress: number): boolean {
  const f = object.flags;
  if (!f.communication) return false;
  return (f.transmit && object.groupAddresses[0] === groupAddress) || f.read;
}

export function objectListens(object: LinkedObject): boolean {
  const f = object.flags;
  return f.communication && (f.write || f.update || f.read);
}

/** Builds the use table from devices, each with the line it sits on (undefined: not on a line). */
export function addressUses(
  devices: Iterable<{
    readonly lineAddress: number | undefined;
    readonly objects: Iterable<LinkedObject>;
  }>,
): Map<number, AddressUse> {
  const uses = new Map<number, { senders: Set<number>; listeners: Set<number> }>();
  for (const device of devices) {
    const line = device.lineAddress;
    if (line === undefined) continue;
    for (const object of device.objects) {
      for (const groupAddress of object.groupAddresses) {
        let use = uses.get(groupAddress);
        if (use === undefined) {
          use = { senders: new Set(), listeners: new Set() };
          uses.set(groupAddress, use);
        }
        if (objectSends(object, groupAddress)) use.senders.add(line);
        if (objectListens(object)) use.listeners.add(line);
      }
    }
  }
  return uses;
}
