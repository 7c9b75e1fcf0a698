import { parseIndividualAddress } from "@/engine";
import { ok } from "@/engine";
import type { Bench, BenchDevice, Position } from "@/engine";
import { getDeviceType, type GroupObjectFlags } from "@/engine";
import { dptSizeBits } from "@/engine";
import { deviceObjects } from "./device-objects";
import { refuse, type EditResult } from "./edit-refusal";
import { sameGroupAddress } from "./group-address-key";
import {
  lineOfIndividualAddress,
  nextIndividualAddress,
  takenIndividualAddresses,
} from "./individual-addresses";

export interface AddDeviceInput {
  /** Device type id from the catalogue. */
  readonly type: string;
  /** Line id; the first line when absent. Ignored for unit-link-only types. */
  readonly line?: string;
  readonly name?: string;
  readonly position?: Position;
}

/** A fresh id "<type>-<n>" no device on the bench uses yet. */
export function freshDeviceId(
  bench: Bench,
  typeId: string,
  taken: ReadonlySet<string> = new Set(bench.devices.map((d) => d.id)),
): string {
  for (let n = 1; ; n++) {
    const id = `${typeId}-${n}`;
    if (!taken.has(id)) return id;
  }
}

/**
 * Adds a device of a catalogue type with default parameters. A KNX device gets
 * the lowest free individual address on the chosen line; a device that sits
 * only on a unit link gets none.
 */
export function addDevice(
  bench: Bench,
  input: AddDeviceInput,
): EditResult<{ bench: Bench; deviceId: string }> {
  const type = getDeviceType(input.type);
  if (type === undefined)
    return refuse(
      "edit.device-type-unknown",
      `no device type "${input.type}" in the catalogue`,
      "type",
    );
  const id = freshDeviceId(bench, type.id);
  const count = bench.devices.filter((d) => d.type === type.id).length + 1;
  const device: BenchDevice = {
    id,
    type: type.id,
    name: input.name ?? `${type.label} ${count}`,
    parameters: {},
  };
  if (type.medium === "knx") {
    const line =
      input.line === undefined ? bench.lines[0] : bench.lines.find((l) => l.id === input.line);
    if (line === undefined)
      return refuse("edit.line-unknown", `no line "${input.line}" on the bench`, "line");
    const address = nextIndividualAddress(bench, line);
    if (address === undefined)
      return refuse(
        "edit.line-full",
        `line ${line.address} "${line.name}" has no free individual address`,
        "line",
      );
    device.line = line.id;
    device.individualAddress = address;
  }
  if (input.position !== undefined) device.position = input.position;
  return ok({ bench: { ...bench, devices: [...bench.devices, device] }, deviceId: id });
}

/** Removes devices with their links and their places on unit links (a link left with one member goes too). */
export function removeDevices(bench: Bench, ids: readonly string[]): Bench {
  const gone = new Set(ids);
  return {
    ...bench,
    devices: bench.devices.filter((d) => !gone.has(d.id)),
    links: bench.links.filter((l) => !gone.has(l.device)),
    unitLinks: bench.unitLinks
      .map((u) => ({ ...u, members: u.members.filter((m) => !gone.has(m)) }))
      .filter((u) => u.members.length >= 2),
  };
}

function updateDevice(
  bench: Bench,
  id: string,
  update: (device: BenchDevice) => BenchDevice,
): Bench {
  return { ...bench, devices: bench.devices.map((d) => (d.id === id ? update(d) : d)) };
}

function findDevice(bench: Bench, id: string): EditResult<BenchDevice> {
  const device = bench.devices.find((d) => d.id === id);
  return device === undefined
    ? refuse("edit.device-unknown", `no device "${id}" on the bench`, "device")
    : ok(device);
}

export function renameDevice(bench: Bench, id: string, name: string): EditResult {
  const device = findDevice(bench, id);
  if (!device.ok) return device;
  if (name.trim() === "") return refuse("edit.name-empty", "a device needs a name", "name");
  return ok(updateDevice(bench, id, (d) => ({ ...d, name: name.trim() })));
}

/**
 * Sets a KNX device's individual address; the device moves to the line whose
 * address matches, if the bench has one.
 */
export function setIndividualAddress(bench: Bench, id: string, text: string): EditResult {
  const device = findDevice(bench, id);
  if (!device.ok) return device;
  const raw = parseIndividualAddress(text);
  if (!raw.ok) return refuse("edit.address-invalid", raw.error.message, "individualAddress");
  if (takenIndividualAddresses(bench, id).has(raw.value)) {
    return refuse(
      "edit.address-taken",
      `individual address ${text.trim()} is already used on this bench`,
      "individualAddress",
    );
  }
  const line = lineOfIndividualAddress(bench, raw.value);
  return ok(
    updateDevice(bench, id, (d) => ({
      ...d,
      individualAddress: text.trim(),
      ...(line ? { line: line.id } : {}),
    })),
  );
}

/**
 * Puts a device in one of the bench's rooms (it then reads and acts on that
 * room), or, with undefined, in none (it models a room of its own, if it needs one).
 */
export function setDeviceRoom(bench: Bench, id: string, room: string | undefined): EditResult {
  const device = findDevice(bench, id);
  if (!device.ok) return device;
  if (room !== undefined && !(bench.rooms ?? []).some((r) => r.id === room))
    return refuse("edit.room-unknown", `no room "${room}" on this bench`, "room");
  return ok(
    updateDevice(bench, id, (d) => {
      const next: BenchDevice = { ...d, room };
      if (room === undefined) delete next.room;
      return next;
    }),
  );
}

export interface SetParametersOutcome {
  readonly bench: Bench;
  /** Links dropped because their object vanished or changed size. */
  readonly droppedLinks: number;
}

/**
 * Replaces a device's parameters after checking them against the type's
 * schema. Objects come and go with the parameters (the type's
 * groupObjects(params)); links and flag overrides of objects that vanished are
 * dropped, and so are links whose object now carries a value of another size
 * than its address.
 */
export function setParameters(
  bench: Bench,
  id: string,
  parameters: Record<string, unknown>,
): EditResult<SetParametersOutcome> {
  const device = findDevice(bench, id);
  if (!device.ok) return device;
  const type = getDeviceType(device.value.type);
  if (type === undefined)
    return refuse(
      "edit.device-type-unknown",
      `no device type "${device.value.type}" in the catalogue`,
      "type",
    );
  const parsed = type.parameters.safeParse(parameters);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const field = ["parameters", ...issue.path.map(String)].join(".");
    return refuse("edit.parameters-invalid", `${field}: ${issue.message}`, field);
  }
  const updated: BenchDevice = {
    ...device.value,
    parameters: parsed.data as Record<string, unknown>,
  };
  const objects = new Map(deviceObjects(updated).map((o) => [o.number, o]));
  if (updated.objectFlags !== undefined) {
    updated.objectFlags = Object.fromEntries(
      Object.entries(updated.objectFlags).filter(([key]) => objects.has(Number(key))),
    );
  }
  const sizeOf = (address: string) => {
    const declared = bench.groupAddresses.find((g) => sameGroupAddress(g.address, address));
    return declared === undefined ? undefined : dptSizeBits(declared.dpt);
  };
  const links = bench.links.filter((link) => {
    if (link.device !== id) return true;
    const object = objects.get(link.object);
    if (object === undefined) return false;
    const size = sizeOf(link.groupAddress);
    return size === undefined || size === object.sizeBits;
  });
  const next = { ...updateDevice(bench, id, () => updated), links };
  return ok({ bench: next, droppedLinks: bench.links.length - links.length });
}

/**
 * Sets one object's flags. Only flags that differ from the type's default are
 * stored, so the file stays small and follows the type when it changes.
 */
export function setObjectFlags(
  bench: Bench,
  id: string,
  object: number,
  flags: Partial<GroupObjectFlags>,
): EditResult {
  const device = findDevice(bench, id);
  if (!device.ok) return device;
  const type = getDeviceType(device.value.type);
  const spec = deviceObjects({ ...device.value, objectFlags: {} }).find((o) => o.number === object);
  if (type === undefined || spec === undefined)
    return refuse("edit.object-unknown", `device "${id}" has no group object ${object}`, "object");
  const merged = { ...spec.flags, ...device.value.objectFlags?.[String(object)], ...flags };
  const override = Object.fromEntries(
    (Object.keys(merged) as (keyof GroupObjectFlags)[])
      .filter((key) => merged[key] !== spec.flags[key])
      .map((key) => [key, merged[key]]),
  );
  const objectFlags = { ...device.value.objectFlags };
  if (Object.keys(override).length === 0) delete objectFlags[String(object)];
  else objectFlags[String(object)] = override;
  return ok(
    updateDevice(bench, id, (d) => {
      const next: BenchDevice = { ...d, objectFlags };
      if (Object.keys(objectFlags).length === 0) delete next.objectFlags;
      return next;
    }),
  );
}
