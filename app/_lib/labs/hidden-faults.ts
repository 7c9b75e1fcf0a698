import { z } from "zod";
import { err, ok, type Result } from "@/engine";

/**
 * Faults a trainer hides in a lab: edits applied to the lab bench's document
 * when an apprentice's private copy is made. The apprentice never sees the
 * list, only a bench that misbehaves, and finds and undoes the edit.
 *
 * - relink: the link of a device's object to one group address moves to another
 *   (a wiring mistake: the door rocker on the ceiling lights);
 * - unlink: a link is removed (a status object nobody listens to);
 * - set-parameter: a device parameter is changed (two primaries on a unit link).
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
]);
export type HiddenFault = z.infer<typeof hiddenFaultSchema>;

export const hiddenFaultsSchema = z.array(hiddenFaultSchema).max(20, "at most 20 hidden faults");

interface BenchLike {
  devices?: { id: string; parameters?: Record<string, unknown> }[];
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

/** The stored list (labs.hidden_faults), checked on read; a bad column reads as no faults. */
export function parseHiddenFaults(text: string): HiddenFault[] {
  try {
    const parsed = hiddenFaultsSchema.safeParse(JSON.parse(text));
    return parsed.success ? parsed.data : [];
  } catch {
    return [];
  }
}
