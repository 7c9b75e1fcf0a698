import {
  COUPLER_TYPE_ID,
  areaOf,
  lineNumberOf,
  formatGroupAddress,
  formatLineAddress,
  generateFilterTableTexts,
  loadBench,
  ok,
  parseGroupAddress,
  parseIndividualAddress,
  upperLineAddress,
  type GroupTelegramMode,
  type IndividualTelegramMode,
} from "@/engine";
import type { Bench, BenchDevice, BenchLine } from "@/engine";
import { refuse, type EditResult } from "./edit-refusal";
import { freshDeviceId } from "./devices";
import { lineHighByte, takenIndividualAddresses } from "./individual-addresses";

export type { GroupTelegramMode, IndividualTelegramMode };

/** Area and line numbers run 0..15 (knx-reference.md, Topology: 15 areas, 15 lines per area). */
const MAX_NUMBER = 15;

function lineNumbers(line: BenchLine): { area: number; line: number } {
  const address = lineHighByte(line);
  return { area: areaOf(address), line: lineNumberOf(address) };
}

function lineId(bench: Bench, area: number, line: number): string {
  const base = area === 0 && line === 0 ? "line-backbone" : `line-${area}-${line}`;
  const taken = new Set(bench.lines.map((l) => l.id));
  for (let n = 1; ; n++) {
    const id = n === 1 ? base : `${base}-${n}`;
    if (!taken.has(id)) return id;
  }
}

/**
 * Adds line a.l with a name. Line 0 of an area is its main line and area 0's
 * main line is the backbone (knx-reference.md, Topology).
 */
export function addLine(
  bench: Bench,
  input: { readonly area: number; readonly line: number; readonly name?: string },
): EditResult<{ bench: Bench; lineId: string }> {
  const { area, line } = input;
  if (!Number.isInteger(area) || area < 0 || area > MAX_NUMBER)
    return refuse("edit.line-invalid", `an area number is 0 to ${MAX_NUMBER}`, "area");
  if (!Number.isInteger(line) || line < 0 || line > MAX_NUMBER)
    return refuse("edit.line-invalid", `a line number is 0 to ${MAX_NUMBER}`, "line");
  const address = `${area}.${line}`;
  if (bench.lines.some((l) => l.address === address))
    return refuse("edit.line-exists", `line ${address} is already on the bench`, "line");
  const name =
    input.name?.trim() ||
    (area === 0 && line === 0
      ? "Backbone"
      : line === 0
        ? `Area ${area} main line`
        : `Line ${address}`);
  const id = lineId(bench, area, line);
  return ok({ bench: { ...bench, lines: [...bench.lines, { id, address, name }] }, lineId: id });
}

/** Adds area a: its display name and its main line a.0. */
export function addArea(
  bench: Bench,
  input: { readonly area: number; readonly name?: string },
): EditResult<{ bench: Bench; lineId: string }> {
  if (bench.lines.some((l) => lineNumbers(l).area === input.area))
    return refuse("edit.line-exists", `area ${input.area} is already on the bench`, "area");
  const added = addLine(bench, { area: input.area, line: 0 });
  if (!added.ok) return added;
  const name = input.name?.trim() || `Area ${input.area}`;
  const areas = [
    ...(bench.areas ?? []).filter((a) => a.number !== input.area),
    { number: input.area, name },
  ].sort((a, b) => a.number - b.number);
  return ok({ bench: { ...added.value.bench, areas }, lineId: added.value.lineId });
}

/**
 * The individual address a coupler of this line takes: a.l.0 for a line
 * coupler, a.0.0 for an area coupler; none for the backbone, which has no
 * line above (knx-reference.md, Topology).
 */
export function proposedCouplerAddress(line: BenchLine): string | undefined {
  const { area, line: number } = lineNumbers(line);
  if (area === 0 && number === 0) return undefined;
  return `${area}.${number}.0`;
}

/** The line a coupler of `line` joins it to: a.0 above a.l, the backbone 0.0 above a.0. */
export function upperLineOf(bench: Bench, line: BenchLine): BenchLine | undefined {
  const upper = upperLineAddress(lineHighByte(line));
  if (upper === undefined) return undefined;
  return bench.lines.find((l) => l.address === formatLineAddress(upper));
}

export function isCouplerDevice(device: BenchDevice): boolean {
  return device.type === COUPLER_TYPE_ID;
}

/** Adds the coupler joining `lineId` to the line above, at the address the line proposes. */
export function addCoupler(
  bench: Bench,
  lineIdToJoin: string,
): EditResult<{ bench: Bench; deviceId: string }> {
  const line = bench.lines.find((l) => l.id === lineIdToJoin);
  if (line === undefined)
    return refuse("edit.line-unknown", `no line "${lineIdToJoin}" on the bench`, "line");
  const address = proposedCouplerAddress(line);
  if (address === undefined)
    return refuse(
      "edit.coupler-invalid",
      "the backbone 0.0 has no line above it to couple to",
      "line",
    );
  const upper = upperLineOf(bench, line);
  if (upper === undefined) {
    const wanted =
      lineNumbers(line).line === 0
        ? "0.0 (the backbone)"
        : `${lineNumbers(line).area}.0 (the main line)`;
    return refuse(
      "edit.coupler-invalid",
      `add line ${wanted} first: a coupler joins line ${line.address} to it`,
      "line",
    );
  }
  const raw = parseIndividualAddress(address);
  if (raw.ok && takenIndividualAddresses(bench).has(raw.value))
    return refuse(
      "edit.address-taken",
      `individual address ${address} is already used on this bench`,
      "individualAddress",
    );
  const id = freshDeviceId(bench, COUPLER_TYPE_ID);
  const kind = lineNumbers(line).line === 0 ? "area coupler" : "line coupler";
  const device: BenchDevice = {
    id,
    type: COUPLER_TYPE_ID,
    name: `${line.name} ${kind}`,
    line: line.id,
    individualAddress: address,
    parameters: { groupTelegrams: "filter", individualTelegrams: "route" },
  };
  return ok({ bench: { ...bench, devices: [...bench.devices, device] }, deviceId: id });
}

function updateCoupler(
  bench: Bench,
  id: string,
  update: (parameters: Record<string, unknown>) => Record<string, unknown>,
): EditResult {
  const device = bench.devices.find((d) => d.id === id);
  if (device === undefined || !isCouplerDevice(device))
    return refuse("edit.device-unknown", `no coupler "${id}" on the bench`, "device");
  return ok({
    ...bench,
    devices: bench.devices.map((d) =>
      d.id === id
        ? { ...d, parameters: update({ ...(d.parameters as Record<string, unknown>) }) }
        : d,
    ),
  });
}

/** Sets how a coupler passes group telegrams (filter by table, forward all, block all). */
export function setGroupTelegrams(bench: Bench, id: string, mode: GroupTelegramMode): EditResult {
  return updateCoupler(bench, id, (p) => ({ ...p, groupTelegrams: mode }));
}

/** Sets how a coupler passes individually addressed telegrams (route by address, forward all, block all). */
export function setIndividualTelegrams(
  bench: Bench,
  id: string,
  mode: IndividualTelegramMode,
): EditResult {
  return updateCoupler(bench, id, (p) => ({ ...p, individualTelegrams: mode }));
}

/** The coupler's table as the links would generate it now, as address texts; undefined when the bench does not load. */
export function generatedFilterTable(bench: Bench, id: string): string[] | undefined {
  const loaded = loadBench(bench);
  if (!loaded.ok) return undefined;
  return generateFilterTableTexts(loaded.value, id);
}

/** The coupler's stored table, or undefined when it follows the links. */
export function storedFilterTable(device: BenchDevice): string[] | undefined {
  const table = (device.parameters as Record<string, unknown>).filterTable;
  return Array.isArray(table) ? table.filter((e): e is string => typeof e === "string") : undefined;
}

function sortedAddresses(entries: readonly string[]): string[] {
  const raw = (text: string) => {
    const parsed = parseGroupAddress(text);
    return parsed.ok ? parsed.value : Number.MAX_SAFE_INTEGER;
  };
  return [...new Set(entries)].sort((a, b) => raw(a) - raw(b));
}

/** Stores the table generated from the links now, as commissioning writes it into the coupler. */
export function regenerateFilterTable(bench: Bench, id: string): EditResult {
  const table = generatedFilterTable(bench, id);
  if (table === undefined)
    return refuse(
      "edit.coupler-invalid",
      "the bench does not load, so no table can be generated",
      "filterTable",
    );
  return updateCoupler(bench, id, (p) => ({ ...p, filterTable: table }));
}

/** Drops the stored table: the coupler's table is generated from the links whenever the bench loads. */
export function followLinks(bench: Bench, id: string): EditResult {
  return updateCoupler(bench, id, (p) => {
    const next = { ...p };
    delete next.filterTable;
    return next;
  });
}

/** Adds one entry to the stored table by hand (a table that followed the links is stored first). */
export function addFilterEntry(bench: Bench, id: string, address: string): EditResult {
  const raw = parseGroupAddress(address);
  if (!raw.ok) return refuse("edit.address-invalid", raw.error.message, "filterTable");
  const text = formatGroupAddress(raw.value);
  const device = bench.devices.find((d) => d.id === id);
  const current =
    device === undefined
      ? []
      : (storedFilterTable(device) ?? generatedFilterTable(bench, id) ?? []);
  if (current.includes(text))
    return refuse("edit.coupler-invalid", `${text} is already in the filter table`, "filterTable");
  return updateCoupler(bench, id, (p) => ({
    ...p,
    filterTable: sortedAddresses([...current, text]),
  }));
}

/** Removes one entry from the stored table by hand. */
export function removeFilterEntry(bench: Bench, id: string, address: string): EditResult {
  const device = bench.devices.find((d) => d.id === id);
  const current =
    device === undefined
      ? []
      : (storedFilterTable(device) ?? generatedFilterTable(bench, id) ?? []);
  return updateCoupler(bench, id, (p) => ({
    ...p,
    filterTable: current.filter((e) => e !== address),
  }));
}

/** One row of a coupler's filter table view: in the table, needed by the links, or both. */
export interface FilterTableRow {
  readonly address: string;
  /** In the table the coupler uses (stored, or generated when nothing is stored). */
  readonly inTable: boolean;
  /** The links need it to cross this coupler. */
  readonly needed: boolean;
}

/**
 * The table as the panel shows it: every entry the coupler uses and every
 * address the links need, so a stale stored table shows what it blocks
 * (needed, not in the table) and what it passes for nothing (in, not needed).
 */
export function filterTableRows(bench: Bench, device: BenchDevice): FilterTableRow[] {
  const generated = generatedFilterTable(bench, device.id) ?? [];
  const stored = storedFilterTable(device);
  const used = new Set(stored ?? generated);
  const needed = new Set(generated);
  return sortedAddresses([...used, ...needed]).map((address) => ({
    address,
    inTable: used.has(address),
    needed: needed.has(address),
  }));
}
