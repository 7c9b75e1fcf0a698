import { z } from "zod";
import {
  err,
  formatGroupAddress,
  generateFilterTable,
  loadBench,
  ok,
  parseGroupAddress,
  type Result,
} from "@/engine";

/**
 * Faults a trainer hides in a lab: edits applied to the lab bench's document
 * when an apprentice's private copy is made. The apprentice never sees the
 * list, only a bench that misbehaves, and finds and undoes the edit.
 *
 * - relink: the link of a device's object to one group address moves to another
 *   (a wiring mistake: the door rocker on the ceiling lights);
 * - unlink: a link is removed (a status object nobody listens to);
 * - set-parameter: a device parameter is changed (two primaries on a unit link);
 * - stale-filter-table: a group address is missing from a coupler's stored
 *   filter table, as when an address is added after the tables were generated
 *   and nobody regenerated them; the coupler then blocks it (a table the bench
 *   did not store yet is first generated from the links, as commissioning would).
 */
const deviceIdSchema = z.string().min(1, "choose a device");
const groupAddressSchema = z.string().min(1, "choose a group address");

export const hiddenFaultSchema = z.discriminatedUnion("kind", [
  z.strictObject({
    kind: z.literal("relink"),
    device: deviceIdSchema,
    object: z.number().int().nonnegative(),
    from: groupAddressSchema,
    to: groupAddressSchema,
  }),
  z.strictObject({
    kind: z.literal("unlink"),
    device: deviceIdSchema,
    object: z.number().int().nonnegative(),
    groupAddress: groupAddressSchema,
  }),
  z.strictObject({
    kind: z.literal("set-parameter"),
    device: deviceIdSchema,
    parameter: z.string().min(1, "name the parameter"),
    value: z.json(),
  }),
  z.strictObject({
    kind: z.literal("stale-filter-table"),
    coupler: z.string().min(1, "choose a coupler"),
    groupAddress: groupAddressSchema,
  }),
]);
export type HiddenFault = z.infer<typeof hiddenFaultSchema>;

export const hiddenFaultsSchema = z.array(hiddenFaultSchema).max(20, "at most 20 hidden faults");

interface BenchLike {
  devices?: { id: string; type?: string; parameters?: Record<string, unknown> }[];
  groupAddresses?: { address: string }[];
  links?: { device: string; object: number; groupAddress: string }[];
}

/** Why a hidden fault cannot be applied to this bench, naming the fault's field. */
export interface HiddenFaultProblem {
  readonly index: number;
  readonly field: string;
  readonly message: string;
}

/**
 * The bench document with the faults applied, or the first fault that does not
 * fit the bench. Links keep their position, so a relinked sending link stays
 * the object's sending address.
 */
export function applyHiddenFaults(
  document: unknown,
  faults: readonly HiddenFault[],
): Result<unknown, HiddenFaultProblem> {
  const bench = structuredClone(document) as BenchLike;
  const devices = bench.devices ?? [];
  const addresses = new Set((bench.groupAddresses ?? []).map((ga) => ga.address));
  const links = bench.links ?? [];
  for (const [index, fault] of faults.entries()) {
    if (fault.kind === "stale-filter-table") {
      const stale = staleFilterTable({ ...bench, links }, fault.coupler, fault.groupAddress);
      if (!stale.ok) return err({ index, ...stale.error });
      continue;
    }
    const device = devices.find((d) => d.id === fault.device);
    if (!device)
      return err({ index, field: "device", message: `no device "${fault.device}" on the bench` });
    if (fault.kind === "set-parameter") {
      device.parameters = { ...(device.parameters ?? {}), [fault.parameter]: fault.value };
      continue;
    }
    const address = fault.kind === "relink" ? fault.from : fault.groupAddress;
    const at = links.findIndex(
      (l) => l.device === fault.device && l.object === fault.object && l.groupAddress === address,
    );
    if (at < 0) {
      return err({
        index,
        field: fault.kind === "relink" ? "from" : "groupAddress",
        message: `${fault.device} object ${fault.object} is not linked to ${address}`,
      });
    }
    if (fault.kind === "unlink") {
      links.splice(at, 1);
      continue;
    }
    if (!addresses.has(fault.to)) {
      return err({
        index,
        field: "to",
        message: `${fault.to} is not a group address of the bench`,
      });
    }
    links[at] = { ...links[at]!, groupAddress: fault.to };
  }
  return ok({ ...bench, links });
}

/** Couplers are devices of this catalogue type (topology contract). */
const COUPLER_TYPE = "coupler";

/**
 * Takes `address` out of the coupler's filter table in `bench` (in place):
 * the stored table if the bench has one, else the table generated from the
 * links. Refuses an address the table does not hold (removing it would hide
 * nothing) and a coupler that does not filter (its table is not read).
 */
function staleFilterTable(
  bench: BenchLike,
  couplerId: string,
  address: string,
): Result<void, { field: string; message: string }> {
  const coupler = (bench.devices ?? []).find((d) => d.id === couplerId);
  if (coupler === undefined || coupler.type !== COUPLER_TYPE)
    return err({ field: "coupler", message: `no coupler "${couplerId}" on the bench` });
  const parameters = coupler.parameters ?? {};
  const mode = parameters.groupTelegrams ?? "filter";
  if (mode !== "filter")
    return err({
      field: "coupler",
      message: `${couplerId} does not filter group telegrams (it is set to ${String(mode)}), so its table is not read`,
    });
  const wanted = parseGroupAddress(address);
  if (!wanted.ok) return err({ field: "groupAddress", message: wanted.error.message });
  let table: number[];
  if (Array.isArray(parameters.filterTable)) {
    table = parameters.filterTable.flatMap((entry) => {
      const raw = typeof entry === "string" ? parseGroupAddress(entry) : undefined;
      return raw?.ok ? [raw.value] : [];
    });
  } else {
    const loaded = loadBench(bench);
    if (!loaded.ok)
      return err({
        field: "coupler",
        message: `the bench does not load, so ${couplerId}'s filter table cannot be generated`,
      });
    table = generateFilterTable(loaded.value, couplerId);
  }
  if (!table.includes(wanted.value))
    return err({
      field: "groupAddress",
      message: `${address} is not in ${couplerId}'s filter table: nothing on its line uses it across the coupler`,
    });
  coupler.parameters = {
    ...parameters,
    filterTable: table.filter((raw) => raw !== wanted.value).map((raw) => formatGroupAddress(raw)),
  };
  return ok(undefined);
}

/** The stored list (labs.hidden_faults), checked on read; a bad column reads as no faults. */
export function parseHiddenFaults(text: string): HiddenFault[] {
  try {
    const parsed = hiddenFaultsSchema.safeParse(JSON.parse(text));
    return parsed.success ? parsed.data : [];
  } catch {
    return [];
  }
}
