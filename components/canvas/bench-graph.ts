import type { Edge, Node } from "@xyflow/react";
import { formatIndividualAddress, parseGroupAddress, parseIndividualAddress } from "@/engine";
import type { Bench, BenchDevice, BenchGroupAddress, Position } from "@/engine";
import type { CheckFinding, CheckSeverity } from "@/engine";
import { getDeviceType } from "@/engine";
import { deviceObjects, type EditorObject } from "@/components/bench-editor/model/device-objects";
import { groupAddressKey } from "@/components/bench-editor/model/group-address-key";
import { joinsUnitLinks } from "@/components/bench-editor/model/unit-links";
import {
  BUS_HANDLE,
  busBarNodeId,
  deviceNodeId,
  objectHandleId,
  UNIT_LINK_HANDLE,
} from "./node-ids";

export interface DeviceObjectRow extends EditorObject {
  /** Sending address text, when the object has a link. */
  readonly sendingAddress?: string;
  /** How many addresses the object is linked to. */
  readonly linkCount: number;
  readonly severity?: CheckSeverity;
}

export type DeviceNodeData = {
  readonly device: BenchDevice;
  readonly typeLabel: string;
  readonly objects: readonly DeviceObjectRow[];
  readonly unitLinkPort: boolean;
  readonly severity?: CheckSeverity;
  /** Object row highlighted from a finding or the object list. */
  readonly focusObject?: number;
  /** Faults active on the device in a running simulation (live console); drawn in fault red. */
  readonly faults?: readonly string[];
};

export type BusBarNodeData = {
  readonly groupAddress: BenchGroupAddress;
  readonly linkCount: number;
  readonly severity?: CheckSeverity;
};

export type FloorPlanNodeData = {
  readonly url: string;
  readonly width: number;
  readonly height: number;
};

export type DeviceNode = Node<DeviceNodeData, "device">;
export type BusBarNode = Node<BusBarNodeData, "busBar">;
export type FloorPlanNode = Node<FloorPlanNodeData, "floorPlan">;
export type BenchNode = DeviceNode | BusBarNode | FloorPlanNode;

export type LinkEdgeData = {
  readonly device: string;
  readonly object: number;
  readonly groupAddress: string;
  readonly sending: boolean;
};
export type LinkEdge = Edge<LinkEdgeData, "link">;
export type UnitLinkEdge = Edge<{ readonly unitLink: string }, "unitLink">;
export type BenchEdge = LinkEdge | UnitLinkEdge;

/** Card and bus-bar sizes in canvas units; the auto layout and the nodes share them. */
export const CARD_WIDTH = 248;
export const CARD_HEADER = 52;
export const ROW_HEIGHT = 24;
export const BUS_BAR_WIDTH = 300;
export const BUS_BAR_HEIGHT = 40;
const COLUMN_GAP = 48;
const ROW_GAP = 32;
const DEVICE_COLUMNS = 4;

function worse(a: CheckSeverity | undefined, b: CheckSeverity): CheckSeverity {
  if (a === "error" || b === "error") return "error";
  if (a === "warning" || b === "warning") return "warning";
  return "info";
}

/**
 * Where benches without stored positions put things: device cards in columns
 * on the left, bus-bars stacked on the right in address order with a gap
 * between middle groups. Stored positions always win.
 */
export function autoLayout(bench: Bench): {
  devices: Map<string, Position>;
  addresses: Map<string, Position>;
} {
  const devices = new Map<string, Position>();
  const columnY = Array.from({ length: DEVICE_COLUMNS }, () => 0);
  let column = 0;
  for (const device of bench.devices) {
    if (device.position !== undefined) continue;
    const height = CARD_HEADER + Math.max(1, deviceObjects(device).length) * ROW_HEIGHT;
    devices.set(device.id, { x: column * (CARD_WIDTH + COLUMN_GAP), y: columnY[column]! });
    columnY[column]! += height + ROW_GAP;
    column = (column + 1) % DEVICE_COLUMNS;
  }
  const addresses = new Map<string, Position>();
  const x = DEVICE_COLUMNS * (CARD_WIDTH + COLUMN_GAP) + 160;
  const sorted = bench.groupAddresses
    .filter((g) => g.position === undefined)
    .map((g) => ({ g, raw: parseGroupAddress(g.address) }))
    .sort((a, b) => (a.raw.ok ? a.raw.value : 0) - (b.raw.ok ? b.raw.value : 0));
  let y = 0;
  let group = -1;
  for (const { g, raw } of sorted) {
    const middle = raw.ok ? raw.value >>> 8 : -1;
    if (group !== -1 && middle !== group) y += 28;
    group = middle;
    addresses.set(groupAddressKey(g.address), { x, y });
    y += BUS_BAR_HEIGHT + 12;
  }
  return { devices, addresses };
}

export interface GraphOptions {
  readonly findings?: readonly CheckFinding[];
  readonly selectedDevices?: ReadonlySet<string>;
  readonly selectedAddresses?: ReadonlySet<string>;
  readonly focusObject?: number;
  readonly floorPlan?: FloorPlanNodeData | null;
  /** Active fault ids per device id, from a running simulation. */
  readonly faults?: ReadonlyMap<string, readonly string[]>;
}

/** The canvas view of a bench: one card per device, one bus-bar per group address, one edge per link and unit link. */
export function benchGraph(
  bench: Bench,
  options: GraphOptions = {},
): { nodes: BenchNode[]; edges: BenchEdge[] } {
  const layout = autoLayout(bench);
  const deviceSeverity = new Map<string, CheckSeverity>();
  const objectSeverity = new Map<string, CheckSeverity>();
  const addressSeverity = new Map<string, CheckSeverity>();
  for (const finding of options.findings ?? []) {
    const { device, object, groupAddress } = finding.location;
    if (device !== undefined) {
      deviceSeverity.set(device, worse(deviceSeverity.get(device), finding.severity));
      if (object !== undefined)
        objectSeverity.set(
          `${device}#${object}`,
          worse(objectSeverity.get(`${device}#${object}`), finding.severity),
        );
    }
    if (groupAddress !== undefined) {
      const key = groupAddressKey(groupAddress);
      addressSeverity.set(key, worse(addressSeverity.get(key), finding.severity));
    }
  }

  const linksByObject = new Map<string, string[]>();
  const linksByAddress = new Map<string, number>();
  const edges: BenchEdge[] = [];
  for (const link of bench.links) {
    const objectKey = `${link.device}#${link.object}`;
    const list = linksByObject.get(objectKey) ?? [];
    const sending = list.length === 0;
    list.push(link.groupAddress);
    linksByObject.set(objectKey, list);
    const key = groupAddressKey(link.groupAddress);
    linksByAddress.set(key, (linksByAddress.get(key) ?? 0) + 1);
    edges.push({
      id: `l:${objectKey}@${key}`,
      type: "link",
      source: deviceNodeId(link.device),
      sourceHandle: objectHandleId(link.object),
      target: busBarNodeId(link.groupAddress),
      targetHandle: BUS_HANDLE,
      data: { device: link.device, object: link.object, groupAddress: link.groupAddress, sending },
    });
  }
  for (const unitLink of bench.unitLinks) {
    // Drawn as a chain through the members in order (gateway, indoor unit, wall controller...).
    for (let i = 1; i < unitLink.members.length; i++) {
      edges.push({
        id: `u:${unitLink.id}:${i}`,
        type: "unitLink",
        source: deviceNodeId(unitLink.members[i - 1]!),
        sourceHandle: UNIT_LINK_HANDLE,
        target: deviceNodeId(unitLink.members[i]!),
        targetHandle: UNIT_LINK_HANDLE,
        data: { unitLink: unitLink.id },
        deletable: false,
      });
    }
  }

  const nodes: BenchNode[] = [];
  if (options.floorPlan) {
    nodes.push({
      id: "floor-plan",
      type: "floorPlan",
      position: { x: -40, y: -40 },
      data: options.floorPlan,
      draggable: false,
      selectable: false,
      deletable: false,
      focusable: false,
      zIndex: -1,
    });
  }
  for (const device of bench.devices) {
    const type = getDeviceType(device.type);
    const objects: DeviceObjectRow[] = deviceObjects(device).map((object) => {
      const links = linksByObject.get(`${device.id}#${object.number}`) ?? [];
      const severity = objectSeverity.get(`${device.id}#${object.number}`);
      return {
        ...object,
        linkCount: links.length,
        ...(links[0] === undefined ? {} : { sendingAddress: links[0] }),
        ...(severity === undefined ? {} : { severity }),
      };
    });
    const severity = deviceSeverity.get(device.id);
    const faults = options.faults?.get(device.id);
    const selected = options.selectedDevices?.has(device.id) ?? false;
    nodes.push({
      id: deviceNodeId(device.id),
      type: "device",
      position: device.position ?? layout.devices.get(device.id) ?? { x: 0, y: 0 },
      selected,
      data: {
        device,
        typeLabel: type?.label ?? `unknown type "${device.type}"`,
        objects,
        unitLinkPort: joinsUnitLinks(device.type),
        ...(severity === undefined ? {} : { severity }),
        ...(faults === undefined || faults.length === 0 ? {} : { faults }),
        ...(selected && options.focusObject !== undefined
          ? { focusObject: options.focusObject }
          : {}),
      },
    });
  }
  for (const groupAddress of bench.groupAddresses) {
    const key = groupAddressKey(groupAddress.address);
    const severity = addressSeverity.get(key);
    nodes.push({
      id: busBarNodeId(groupAddress.address),
      type: "busBar",
      position: groupAddress.position ?? layout.addresses.get(key) ?? { x: 0, y: 0 },
      selected: options.selectedAddresses?.has(key) ?? false,
      data: {
        groupAddress,
        linkCount: linksByAddress.get(key) ?? 0,
        ...(severity === undefined ? {} : { severity }),
      },
    });
  }
  return { nodes, edges };
}

/** "1.1.10" for a device with an address, "unit link" otherwise. */
export function deviceAddressLabel(device: BenchDevice): string {
  if (device.individualAddress === undefined) return "unit link";
  const raw = parseIndividualAddress(device.individualAddress);
  return raw.ok ? formatIndividualAddress(raw.value) : device.individualAddress;
}
