import { parseGroupAddress, parseIndividualAddress } from "../address";
import { COUPLER_TYPE_ID } from "../devices/coupler/coupler";
import { addressUses, objectSends, type AddressUse } from "../topology/address-use";
import { groupPasses, type GroupTelegramMode } from "../topology/coupler-rules";
import { generatedFilterTable } from "../topology/filter-table";
import { couplerLines, linePath, parseLineAddress } from "../topology/line-address";
import type { BenchView, DeviceView } from "./bench-view";

/**
 * The topology of a bench document as the check rules see it: line addresses,
 * which line each device sits on, the couplers with their effective filter
 * tables (stored, or generated from the links when absent), and senders and
 * listeners per group address by line. Like the bench view it tolerates what
 * the loader would refuse (a coupler whose lines are missing is left out).
 */
export interface ViewCoupler {
  readonly id: string;
  readonly name: string;
  readonly lowerLine: number;
  readonly upperLine: number;
  readonly groupTelegrams: GroupTelegramMode;
  readonly filterTable: ReadonlySet<number>;
  /** The table as stored in the bench, undefined when generated. */
  readonly storedTable: readonly { readonly raw: number; readonly text: string }[] | undefined;
}

export interface TopologyView {
  /** Line id -> line address (area << 4 | line). */
  readonly lineAddress: ReadonlyMap<string, number>;
  /** Line address -> line id (the first line with that address). */
  readonly lineId: ReadonlyMap<number, string>;
  /** Device id -> line id it sits on (KNX devices with an individual address only). */
  readonly deviceLine: ReadonlyMap<string, string>;
  /** Lower line address -> its coupler. */
  readonly couplerOf: ReadonlyMap<number, ViewCoupler>;
  readonly couplers: readonly ViewCoupler[];
  readonly uses: ReadonlyMap<number, AddressUse>;
  /** Raw group addresses each device sends on, by device id. */
  readonly sendsOn: ReadonlyMap<string, readonly number[]>;
}

const views = new WeakMap<BenchView, TopologyView>();

/** The line a device sits on: its `line`, else the line matching its individual address, else the first. */
export function deviceLineId(view: BenchView, entry: DeviceView): string | undefined {
  if (entry.device.line !== undefined) return entry.device.line;
  const lines = view.bench.lines;
  if (entry.device.individualAddress !== undefined) {
    const parsed = parseIndividualAddress(entry.device.individualAddress);
    if (parsed.ok) {
      const prefix = `${parsed.value >> 12}.${(parsed.value >> 8) & 15}`;
      const match = lines.find((line) => line.address === prefix);
      if (match) return match.id;
    }
  }
  return lines[0]?.id;
}

export function topologyView(view: BenchView): TopologyView {
  const kept = views.get(view);
  if (kept !== undefined) return kept;
  const lineAddress = new Map<string, number>();
  const lineId = new Map<number, string>();
  for (const line of view.bench.lines) {
    const address = parseLineAddress(line.address);
    lineAddress.set(line.id, address);
    if (!lineId.has(address)) lineId.set(address, line.id);
  }
  const deviceLine = new Map<string, string>();
  const sendsOn = new Map<string, number[]>();
  const members: {
    lineAddress: number | undefined;
    objects: { flags: DeviceView["objects"][number]["flags"]; groupAddresses: readonly number[] }[];
  }[] = [];
  for (const [id, entry] of view.devices) {
    if (entry.type?.medium === "unit-link" || entry.device.individualAddress === undefined)
      continue;
    const line = deviceLineId(view, entry);
    if (line === undefined) continue;
    deviceLine.set(id, line);
    const objects = entry.objects.map((spec) => ({
      flags: spec.flags,
      groupAddresses: view.linksOf(id, spec.number),
    }));
    members.push({ lineAddress: lineAddress.get(line), objects });
    const sends: number[] = [];
    for (const object of objects)
      for (const raw of object.groupAddresses)
        if (objectSends(object, raw) && !sends.includes(raw)) sends.push(raw);
    sendsOn.set(id, sends);
  }
  const uses = addressUses(members);

  const couplers: ViewCoupler[] = [];
  const couplerOf = new Map<number, ViewCoupler>();
  for (const [id, entry] of view.devices) {
    if (entry.type?.id !== COUPLER_TYPE_ID || entry.device.individualAddress === undefined)
      continue;
    const ia = parseIndividualAddress(entry.device.individualAddress);
    const joined = ia.ok ? couplerLines(ia.value) : undefined;
    if (joined === undefined || !lineId.has(joined.lower) || !lineId.has(joined.upper)) continue;
    const p = entry.parameters as { groupTelegrams?: GroupTelegramMode; filterTable?: unknown };
    const stored = Array.isArray(p.filterTable)
      ? p.filterTable.flatMap((text) => {
          const raw = typeof text === "string" ? parseGroupAddress(text) : undefined;
          return raw?.ok ? [{ raw: raw.value, text: text as string }] : [];
        })
      : undefined;
    const coupler: ViewCoupler = {
      id,
      name: entry.device.name,
      lowerLine: joined.lower,
      upperLine: joined.upper,
      groupTelegrams: p.groupTelegrams ?? "filter",
      filterTable: new Set(stored?.map((s) => s.raw) ?? generatedFilterTable(uses, joined.lower)),
      storedTable: stored,
    };
    couplers.push(coupler);
    if (!couplerOf.has(joined.lower)) couplerOf.set(joined.lower, coupler);
  }
  const topology = { lineAddress, lineId, deviceLine, couplerOf, couplers, uses, sendsOn };
  views.set(view, topology);
  return topology;
}

/** What stops a group telegram on `groupAddress` from line `from` reaching line `to`, or undefined when it gets there. */
export function blockedOnPath(
  topology: TopologyView,
  groupAddress: number,
  from: number,
  to: number,
):
  | { readonly kind: "no-coupler"; readonly lower: number }
  | { readonly kind: "filter" | "blocked"; readonly coupler: ViewCoupler }
  | undefined {
  for (const hop of linePath(from, to)) {
    const coupler = topology.couplerOf.get(hop.lower);
    if (coupler === undefined) return { kind: "no-coupler", lower: hop.lower };
    const decision = groupPasses(coupler.groupTelegrams, coupler.filterTable, groupAddress);
    if (decision !== "pass") return { kind: decision, coupler };
  }
  return undefined;
}
