import type { NodeRef } from "@/components/bench-editor/model/move-nodes";
import { groupAddressKey } from "@/components/bench-editor/model/group-address-key";

/** Canvas node ids: "d:<device id>" for cards, "g:<raw address>" for bus-bars. */
export function deviceNodeId(id: string): string {
  return `d:${id}`;
}

export function busBarNodeId(address: string): string {
  return `g:${groupAddressKey(address)}`;
}

/** Handle id of a group object's port on a device card. */
export function objectHandleId(object: number): string {
  return `o:${object}`;
}

export const UNIT_LINK_HANDLE = "unit";
/** Node id prefix of a line's region: "ln:<line id>". */
export const LINE_REGION_PREFIX = "ln:";
export const BUS_HANDLE = "bus";

export function objectOfHandle(handle: string | null | undefined): number | undefined {
  if (handle === null || handle === undefined || !handle.startsWith("o:")) return undefined;
  return Number(handle.slice(2));
}

/** What a canvas node id points at, given the bench's address texts by key. */
export function nodeRefOf(
  nodeId: string,
  addressOfKey: (key: string) => string | undefined,
): NodeRef | undefined {
  if (nodeId.startsWith("d:")) return { kind: "device", id: nodeId.slice(2) };
  if (nodeId.startsWith("g:")) {
    const address = addressOfKey(nodeId.slice(2));
    return address === undefined ? undefined : { kind: "group-address", address };
  }
  return undefined;
}

/** MIME type of a device-shelf item dragged onto the canvas: JSON { type, line }. */
export const DEVICE_TYPE_DRAG = "application/x-benchline-device-type";
