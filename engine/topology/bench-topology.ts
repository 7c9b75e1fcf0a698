import { formatGroupAddress, parseGroupAddress } from "../address";
import type { LoadedBench } from "../bench/load-bench";
import { benchView } from "../checks/bench-view";
import { estimateLineLoad } from "../checks/line-load";
import { COUPLER_TYPE_ID, type CouplerParameters } from "../devices/coupler/coupler";
import { addressUses, type AddressUse } from "./address-use";
import type { GroupTelegramMode, IndividualTelegramMode } from "./coupler-rules";
import { generatedFilterTable } from "./filter-table";
import {
  areaOf,
  couplerLines,
  formatLineAddress,
  lineKind,
  upperLineAddress,
  type LineKind,
  parseLineAddress,
} from "./line-address";

/** A coupler of a loaded bench with its settings resolved (the filter table generated when the bench has none). */
export interface TopologyCoupler {
  readonly id: string;
  readonly name: string;
  readonly individualAddress: number;
  readonly kind: "line" | "area";
  /** Line id of its own (lower) line and of the line above. */
  readonly lowerLine: string;
  readonly upperLine: string;
  /** High bytes (area << 4 | line) of the two lines. */
  readonly lowerLineAddress: number;
  readonly upperLineAddress: number;
  readonly groupTelegrams: GroupTelegramMode;
  readonly individualTelegrams: IndividualTelegramMode;
  /** Raw group addresses it passes in "filter" mode. */
  readonly filterTable: ReadonlySet<number>;
  /** True when the bench gave no table and it was generated from the links. */
  readonly tableGenerated: boolean;
  readonly queueCapacity: number;
}

const usesByBench = new WeakMap<LoadedBench, Map<number, AddressUse>>();
const couplersByBench = new WeakMap<LoadedBench, readonly TopologyCoupler[]>();

/** Senders and listeners per group address, by line (kept per loaded bench). */
export function loadedAddressUses(bench: LoadedBench): ReadonlyMap<number, AddressUse> {
  let uses = usesByBench.get(bench);
  if (uses === undefined) {
    const lineAddress = new Map(bench.lines.map((l) => [l.id, l.lineAddress]));
    uses = addressUses(
      bench.devices.map((d) => ({
        lineAddress: d.line === undefined ? undefined : lineAddress.get(d.line),
        objects: d.objects,
      })),
    );
    usesByBench.set(bench, uses);
  }
  return uses;
}

/** The couplers of a loaded bench, in bench order (kept per loaded bench). */
export function benchCouplers(bench: LoadedBench): readonly TopologyCoupler[] {
  const couplers = couplersByBench.get(bench);
  if (couplers !== undefined) return couplers;
  const found: TopologyCoupler[] = [];
  for (const device of bench.devices) {
    if (device.type.id !== COUPLER_TYPE_ID || device.individualAddress === undefined) continue;
    const joined = couplerLines(device.individualAddress);
    const lower = bench.lines.find((l) => l.lineAddress === joined?.lower);
    const upper = bench.lines.find((l) => l.lineAddress === joined?.upper);
    // The loader refuses a coupler without both lines; a bench built around it is a bug.
    if (joined === undefined || lower === undefined || upper === undefined)
      throw new Error(`coupler "${device.id}" does not join two lines of the bench`);
    const p = device.parameters as CouplerParameters;
    const stored = p.filterTable
      ?.map((text) => parseGroupAddress(text))
      .flatMap((r) => (r.ok ? [r.value] : []));
    found.push({
      id: device.id,
      name: device.name,
      individualAddress: device.individualAddress,
      kind: joined.kind,
      lowerLine: lower.id,
      upperLine: upper.id,
      lowerLineAddress: joined.lower,
      upperLineAddress: joined.upper,
      groupTelegrams: p.groupTelegrams,
      individualTelegrams: p.individualTelegrams,
      filterTable: new Set(stored ?? generatedFilterTable(loadedAddressUses(bench), joined.lower)),
      tableGenerated: stored === undefined,
      queueCapacity: p.queueCapacity,
    });
  }
  couplersByBench.set(bench, found);
  return found;
}

/**
 * The group addresses (raw, ascending) the coupler `couplerId` must pass: an
 * address is in it when a sender on one side of the coupler has a listener on
 * the other (the rule and its source: engine/topology/filter-table.ts). What
 * a coupler with no stored `filterTable` uses; throws for an id that is not a
 * coupler of the bench (a bug in the caller).
 */
export function generateFilterTable(bench: LoadedBench, couplerId: string): number[] {
  const device = bench.deviceById.get(couplerId);
  const joined =
    device?.type.id === COUPLER_TYPE_ID && device.individualAddress !== undefined
      ? couplerLines(device.individualAddress)
      : undefined;
  if (joined === undefined) throw new RangeError(`generateFilterTable: no coupler "${couplerId}"`);
  return generatedFilterTable(loadedAddressUses(bench), joined.lower);
}

/** The same table as group address texts ("1/2/3"), as a bench stores it in `filterTable`. */
export function generateFilterTableTexts(bench: LoadedBench, couplerId: string): string[] {
  return generateFilterTable(bench, couplerId).map((raw) => formatGroupAddress(raw));
}

/** One line of the topology panel. */
export interface TopologyLine {
  readonly id: string;
  /** "1.2" */
  readonly address: string;
  readonly name: string;
  readonly kind: LineKind;
  /** KNX devices on the line (its coupler included: a coupler counts on its own, lower line). */
  readonly deviceCount: number;
  /** The coupler joining this line to the line above, when the bench has one. */
  readonly couplerId?: string;
  /** Id of the line above, when it is on the bench. */
  readonly upperLineId?: string;
  /** Expected steady load from configured sending, including what couplers pass into the line, percent. */
  readonly expectedLoadPercent: number;
}

export interface TopologyArea {
  readonly number: number;
  /** From the bench's `areas`, else "Area n" ("Backbone area" for 0). */
  readonly name: string;
  readonly lines: readonly TopologyLine[];
}

/** Areas and lines of a bench for the topology panel. */
export interface BenchTopology {
  readonly areas: readonly TopologyArea[];
}

/** Areas (ascending), each with its lines (main line first, then by address), counts and expected load. */
export function benchTopology(bench: LoadedBench): BenchTopology {
  const couplers = benchCouplers(bench);
  const load = new Map(
    estimateLineLoad(benchView(bench.bench)).map((e) => [e.line, e.loadPercent]),
  );
  const counts = new Map<string, number>();
  for (const device of bench.devices)
    if (device.line !== undefined) counts.set(device.line, (counts.get(device.line) ?? 0) + 1);
  const byArea = new Map<number, TopologyLine[]>();
  for (const line of bench.lines) {
    const upper = upperLineAddress(line.lineAddress);
    const coupler = couplers.find((c) => c.lowerLine === line.id);
    const upperLine = bench.lines.find((l) => l.lineAddress === upper);
    const entry: TopologyLine = {
      id: line.id,
      address: formatLineAddress(line.lineAddress),
      name: line.name,
      kind: lineKind(line.lineAddress),
      deviceCount: counts.get(line.id) ?? 0,
      ...(coupler === undefined ? {} : { couplerId: coupler.id }),
      ...(upperLine === undefined ? {} : { upperLineId: upperLine.id }),
      expectedLoadPercent: load.get(line.id) ?? 0,
    };
    const area = areaOf(line.lineAddress);
    byArea.set(area, [...(byArea.get(area) ?? []), entry]);
  }
  const names = new Map((bench.bench.areas ?? []).map((a) => [a.number, a.name]));
  return {
    areas: [...byArea]
      .sort(([a], [b]) => a - b)
      .map(([number, lines]) => ({
        number,
        name: names.get(number) ?? (number === 0 ? "Backbone area" : `Area ${number}`),
        lines: lines.sort((a, b) => parseLineAddress(a.address) - parseLineAddress(b.address)),
      })),
  };
}
