import type { Edge, Node } from "@xyflow/react";
import {
  formatIndividualAddress,
  formatLineAddress,
  lineKind,
  parseIndividualAddress,
  upperLineAddress,
} from "@/engine";
import { lineHighByte } from "@/components/bench-editor/model/individual-addresses";
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
  LINE_REGION_PREFIX,
  objectHandleId,
  UNIT_LINK_HANDLE,
} from "./node-ids";
import {
  BUS_BAR_HEIGHT,
  BUS_BAR_WIDTH,
  EMPTY_LAYOUT,
  GROUP_PADDING,
  type BenchLayout,
} from "./bench-layout";
import { CARD_WIDTH, cardHeight } from "./bench-layout";
import {
  couplerPosition,
  deviceLines,
  drawsLineRegions,
  isCoupler,
  regionsAround,
  type LineRegionBox,
} from "./line-regions";

export { BUS_BAR_HEIGHT, BUS_BAR_WIDTH, CARD_HEADER, CARD_WIDTH, ROW_HEIGHT } from "./bench-layout";

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
export type AddressGroupNodeData = {
  readonly label: string;
  /** "1/0/…", or empty for addresses that do not parse. */
  readonly range: string;
  readonly width: number;
  readonly height: number;
};
export type AddressGroupNode = Node<AddressGroupNodeData, "addressGroup">;
export type LineRegionNodeData = {
  /** "1.1" */
  readonly address: string;
  readonly name: string;
  readonly kind: "line" | "main" | "backbone";
  readonly deviceCount: number;
  /** Expected load from the bench topology, when known. */
  readonly expectedLoadPercent?: number;
  readonly width: number;
  readonly height: number;
};
export type LineRegionNode = Node<LineRegionNodeData, "lineRegion">;

/** How a coupler passes telegrams (topology contract); missing settings read as the defaults. */
export type CouplerNodeData = {
  readonly device: BenchDevice;
  /** "1.1.0" */
  readonly address: string;
  /** The line it joins its own line to ("1.0"), when the bench has it. */
  readonly upperLine?: string;
  readonly groupTelegrams: string;
  readonly individualTelegrams: string;
  /** Entries of a stored (hand-edited) filter table; undefined when generated from the links. */
  readonly storedEntries?: number;
  readonly severity?: CheckSeverity;
};
export type CouplerNode = Node<CouplerNodeData, "coupler">;
export type BenchNode =
  DeviceNode | BusBarNode | FloorPlanNode | AddressGroupNode | LineRegionNode | CouplerNode;

export type LinkEdgeData = {
  readonly device: string;
  readonly object: number;
  readonly groupAddress: string;
  readonly sending: boolean;
  /** Drawn faint: wires focus on the selection and this wire does not touch it. */
  readonly dimmed?: boolean;
  /** Canvas x of the wire's vertical run, from the layout; absent once either end was moved by hand. */
  readonly channelX?: number;
};
export type LinkEdge = Edge<LinkEdgeData, "link">;
export type UnitLinkEdge = Edge<
  { readonly unitLink: string; readonly dimmed?: boolean },
  "unitLink"
>;
export type BenchEdge = LinkEdge | UnitLinkEdge;

function worse(a: CheckSeverity | undefined, b: CheckSeverity): CheckSeverity {
  if (a === "error" || b === "error") return "error";
  if (a === "warning" || b === "warning") return "warning";
  return "info";
}

/**
 * A frame around the bus-bars of one main/middle group, around where its bars
 * actually are (a dragged bar takes its frame along).
 */
function groupFrames(
  layout: BenchLayout,
  barPosition: (key: string) => Position | undefined,
): AddressGroupNode[] {
  const frames: AddressGroupNode[] = [];
  for (const group of layout.groups) {
    let minX = Infinity;
    let minY = Infinity;
    let maxX = -Infinity;
    let maxY = -Infinity;
    for (const key of group.addresses) {
      const p = barPosition(key);
      if (p === undefined) continue;
      minX = Math.min(minX, p.x);
      minY = Math.min(minY, p.y);
      maxX = Math.max(maxX, p.x + BUS_BAR_WIDTH);
      maxY = Math.max(maxY, p.y + BUS_BAR_HEIGHT);
    }
    if (minX === Infinity) continue;
    frames.push({
      id: `mg:${group.id}`,
      type: "addressGroup",
      position: { x: minX - GROUP_PADDING.side, y: minY - GROUP_PADDING.top },
      data: {
        label:
          group.id === "?"
            ? "Addresses that do not parse"
            : `Main group ${group.main} · middle group ${group.middle}`,
        range: group.id === "?" ? "" : `${group.id}/…`,
        width: maxX - minX + 2 * GROUP_PADDING.side,
        height: maxY - minY + GROUP_PADDING.top + GROUP_PADDING.bottom,
      },
      draggable: false,
      selectable: false,
      deletable: false,
      focusable: false,
      connectable: false,
      zIndex: -1,
    });
  }
  return frames;
}

export interface GraphOptions {
  readonly findings?: readonly CheckFinding[];
  readonly selectedDevices?: ReadonlySet<string>;
  readonly selectedAddresses?: ReadonlySet<string>;
  readonly focusObject?: number;
  readonly floorPlan?: FloorPlanNodeData | null;
  /** Active fault ids per device id, from a running simulation. */
  readonly faults?: ReadonlyMap<string, readonly string[]>;
  /** Where nodes without a stored position go (layoutBench); without it they stack at the origin. */
  readonly layout?: BenchLayout;
  /**
   * Wires that touch no selected card or bus-bar are drawn faint; with nothing
   * selected every wire is faint, so the cards and bars read first.
   */
  readonly focusWires?: boolean;
  /** Expected load per line id (percent), from the engine's bench topology. */
  readonly lineLoads?: ReadonlyMap<string, number>;
}

/** The canvas view of a bench: one card per device, one bus-bar per group address, one edge per link and unit link. */
export function benchGraph(
  bench: Bench,
  options: GraphOptions = {},
): { nodes: BenchNode[]; edges: BenchEdge[] } {
  const layout = options.layout ?? EMPTY_LAYOUT;
  const selectedDevices = options.selectedDevices ?? new Set<string>();
  const selectedAddresses = options.selectedAddresses ?? new Set<string>();
  const focusWires = options.focusWires ?? false;
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

  const movedDevices = new Set(bench.devices.filter((d) => d.position).map((d) => d.id));
  const movedAddresses = new Set(
    bench.groupAddresses.filter((g) => g.position).map((g) => groupAddressKey(g.address)),
  );
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
    const channelX =
      movedDevices.has(link.device) || movedAddresses.has(key)
        ? undefined
        : layout.channels.get(`${objectKey}@${key}`);
    edges.push({
      id: `l:${objectKey}@${key}`,
      type: "link",
      source: deviceNodeId(link.device),
      sourceHandle: objectHandleId(link.object),
      target: busBarNodeId(link.groupAddress),
      targetHandle: BUS_HANDLE,
      data: {
        device: link.device,
        object: link.object,
        groupAddress: link.groupAddress,
        sending,
        ...(channelX === undefined ? {} : { channelX }),
        ...(focusWires && !selectedDevices.has(link.device) && !selectedAddresses.has(key)
          ? { dimmed: true }
          : {}),
      },
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
        data: {
          unitLink: unitLink.id,
          ...(focusWires && !unitLink.members.some((m) => selectedDevices.has(m))
            ? { dimmed: true }
            : {}),
        },
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
  const regionsDrawn = drawsLineRegions(bench);
  const couplers: BenchDevice[] = [];
  for (const device of bench.devices) {
    if (regionsDrawn && isCoupler(device)) {
      couplers.push(device);
      continue;
    }
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
    const selected = selectedDevices.has(device.id);
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
  if (regionsDrawn)
    nodes.push(
      ...lineNodes(
        bench,
        nodes,
        couplers,
        layout.lines,
        deviceSeverity,
        selectedDevices,
        options.lineLoads,
      ),
    );
  const barPositions = new Map<string, Position>();
  for (const groupAddress of bench.groupAddresses) {
    const key = groupAddressKey(groupAddress.address);
    const position = groupAddress.position ?? layout.addresses.get(key);
    if (position !== undefined && !barPositions.has(key)) barPositions.set(key, position);
  }
  // Frames first, so they draw under the bars.
  nodes.push(...groupFrames(layout, (key) => barPositions.get(key)));
  for (const groupAddress of bench.groupAddresses) {
    const key = groupAddressKey(groupAddress.address);
    const severity = addressSeverity.get(key);
    nodes.push({
      id: busBarNodeId(groupAddress.address),
      type: "busBar",
      position: groupAddress.position ?? layout.addresses.get(key) ?? { x: 0, y: 0 },
      selected: selectedAddresses.has(key),
      data: {
        groupAddress,
        linkCount: linksByAddress.get(key) ?? 0,
        ...(severity === undefined ? {} : { severity }),
      },
    });
  }
  return { nodes, edges };
}

/**
 * One region per line around its cards (drawn under them) and one badge per
 * coupler on the top border of its line's region, the boundary with the line above.
 */
function lineNodes(
  bench: Bench,
  drawn: readonly BenchNode[],
  couplers: readonly BenchDevice[],
  laidOut: readonly LineRegionBox[],
  deviceSeverity: ReadonlyMap<string, CheckSeverity>,
  selectedDevices: ReadonlySet<string>,
  lineLoads: ReadonlyMap<string, number> | undefined,
): BenchNode[] {
  const cards = drawn.flatMap((node) =>
    node.type === "device"
      ? [
          {
            id: node.data.device.id,
            position: node.position,
            width: CARD_WIDTH,
            height: cardHeight(node.data.objects.length),
          },
        ]
      : [],
  );
  const regions = regionsAround(bench, cards, laidOut);
  const lineOf = deviceLines(bench);
  const counts = new Map<string, number>();
  for (const device of bench.devices) {
    if (device.individualAddress === undefined) continue;
    const line = lineOf.get(device.id);
    if (line !== undefined) counts.set(line, (counts.get(line) ?? 0) + 1);
  }
  const lineById = new Map(bench.lines.map((l) => [l.id, l]));
  const addresses = new Set(bench.lines.map((l) => l.address));
  const nodes: BenchNode[] = [];
  const regionOf = new Map<string, LineRegionBox>();
  for (const region of regions) {
    const line = lineById.get(region.lineId);
    if (line === undefined) continue;
    regionOf.set(line.id, region);
    const load = lineLoads?.get(line.id);
    nodes.push({
      id: `${LINE_REGION_PREFIX}${line.id}`,
      type: "lineRegion",
      position: region.position,
      data: {
        address: line.address,
        name: line.name,
        kind: lineKind(lineHighByte(line)),
        deviceCount: counts.get(line.id) ?? 0,
        ...(load === undefined ? {} : { expectedLoadPercent: load }),
        width: region.width,
        height: region.height,
      },
      draggable: false,
      selectable: false,
      deletable: false,
      focusable: false,
      connectable: false,
      zIndex: -2,
    });
  }
  const perLine = new Map<string, number>();
  for (const device of couplers) {
    const lineId = lineOf.get(device.id);
    const line = lineId === undefined ? undefined : lineById.get(lineId);
    const region = lineId === undefined ? undefined : regionOf.get(lineId);
    const index = perLine.get(lineId ?? "") ?? 0;
    perLine.set(lineId ?? "", index + 1);
    const upperRaw = line === undefined ? undefined : upperLineAddress(lineHighByte(line));
    const upper = upperRaw === undefined ? undefined : formatLineAddress(upperRaw);
    const parameters = device.parameters as Record<string, unknown>;
    const table = parameters.filterTable;
    const severity = deviceSeverity.get(device.id);
    nodes.push({
      id: deviceNodeId(device.id),
      type: "coupler",
      position:
        device.position ?? (region === undefined ? { x: 0, y: 0 } : couplerPosition(region, index)),
      selected: selectedDevices.has(device.id),
      data: {
        device,
        address: deviceAddressLabel(device),
        ...(upper !== undefined && addresses.has(upper) ? { upperLine: upper } : {}),
        groupTelegrams:
          typeof parameters.groupTelegrams === "string" ? parameters.groupTelegrams : "filter",
        individualTelegrams:
          typeof parameters.individualTelegrams === "string"
            ? parameters.individualTelegrams
            : "route",
        ...(Array.isArray(table) ? { storedEntries: table.length } : {}),
        ...(severity === undefined ? {} : { severity }),
      },
      zIndex: 1,
    });
  }
  return nodes;
}

/** "1.1.10" for a device with an address, "unit link" otherwise. */
export function deviceAddressLabel(device: BenchDevice): string {
  if (device.individualAddress === undefined) return "unit link";
  const raw = parseIndividualAddress(device.individualAddress);
  return raw.ok ? formatIndividualAddress(raw.value) : device.individualAddress;
}
