import type { z } from "zod";
import { parseGroupAddress, parseIndividualAddress } from "../address";
import { err, ok, type Result } from "../core/result";
import "../devices";
import { getDeviceType } from "../devices/catalogue";
import type { AnyDeviceType, GroupObjectFlags, GroupObjectSpec } from "../devices/device-type";
import { dptSizeBits } from "../dpt";
import type { BenchError } from "./bench-error";
import { migrateBench } from "./bench-migrations";
import {
  DEFAULT_OUTDOOR_C,
  DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K,
  DEFAULT_ROOM_UA_W_PER_K,
  type RoomSpec,
} from "../room";
import { benchSchema, type Bench, type BenchRoom, type BenchUnitLink } from "./bench-schema";
import { COUPLER_TYPE_ID } from "../devices/coupler/coupler";
import { checkCouplerLines } from "./coupler-lines";

/** A group object of a loaded device: the type's declaration, the bench's flag overrides and its links. */
export interface LoadedObject {
  readonly number: number;
  readonly spec: GroupObjectSpec;
  /** The type's flags with the bench's overrides applied. */
  readonly flags: GroupObjectFlags;
  readonly dpt: string;
  readonly sizeBits: number;
  /** Raw group addresses in bench order; the first is the sending address. */
  readonly groupAddresses: readonly number[];
}

export interface LoadedDevice {
  readonly id: string;
  readonly name: string;
  readonly type: AnyDeviceType;
  /** Line id, absent for devices that sit only on a unit link. */
  readonly line?: string;
  /** Raw individual address, absent for unit-link-only devices. */
  readonly individualAddress?: number;
  /** Parameters parsed by the type's schema (defaults filled). */
  readonly parameters: unknown;
  readonly objects: readonly LoadedObject[];
  /** Ids of the unit links this device is a member of. */
  readonly unitLinks: readonly string[];
  /** Id of the bench room the device is in; absent: none declared for it. */
  readonly room?: string;
}

/** A bench room with its defaults filled in. */
export interface LoadedRoom {
  readonly id: string;
  readonly name: string;
  readonly spec: RoomSpec;
}

export interface LoadedGroupAddress {
  readonly raw: number;
  /** As written in the bench. */
  readonly text: string;
  readonly name: string;
  readonly dpt: string;
  readonly sizeBits: number;
}

export interface LoadedLine {
  readonly id: string;
  readonly name: string;
  /** High byte of the individual addresses on this line: area << 4 | line. */
  readonly lineAddress: number;
}

/** A bench with every reference resolved and every address a raw number. */
export interface LoadedBench {
  readonly bench: Bench;
  readonly lines: readonly LoadedLine[];
  readonly testToolAddress: number;
  /** Line the test tool is plugged into: the one matching its address, else the first. */
  readonly testToolLine: string;
  readonly groupAddresses: ReadonlyMap<number, LoadedGroupAddress>;
  readonly devices: readonly LoadedDevice[];
  readonly deviceById: ReadonlyMap<string, LoadedDevice>;
  readonly unitLinks: readonly BenchUnitLink[];
  /** The bench's rooms (empty when it declares none). */
  readonly rooms: readonly LoadedRoom[];
}

export interface LoadBenchOptions {
  /** Where device types come from; the built-in catalogue by default. */
  readonly deviceTypes?: (id: string) => AnyDeviceType | undefined;
}

/** "devices", 2, "individualAddress" -> "devices[2].individualAddress". */
export function jsonPath(parts: readonly PropertyKey[]): string {
  let path = "";
  for (const part of parts) {
    if (typeof part === "number") path += `[${part}]`;
    else path += path === "" ? String(part) : `.${String(part)}`;
  }
  return path === "" ? "$" : path;
}

function schemaErrors(
  error: z.ZodError,
  prefix: readonly PropertyKey[],
  kind: BenchError["kind"],
  extra: Partial<BenchError> = {},
): BenchError[] {
  return error.issues.map((issue) => {
    const path = jsonPath([...prefix, ...issue.path]);
    return { ...extra, kind, path, message: `${path}: ${issue.message}` };
  });
}

/**
 * Checks and resolves a bench document (any known format). Returns every
 * problem found, not just the first, each naming the device, object or address
 * at fault.
 */
export function loadBench(
  document: unknown,
  options: LoadBenchOptions = {},
): Result<LoadedBench, readonly BenchError[]> {
  const migrated = migrateBench(document);
  if (!migrated.ok) return err([migrated.error]);
  const parsed = benchSchema.safeParse(migrated.value);
  if (!parsed.success) return err(schemaErrors(parsed.error, [], "bench.schema"));
  return resolveBench(parsed.data, options);
}

/**
 * The ids of one list in the bench (lines, unit links, rooms, devices): each
 * must be unique within its list. `claim` records an id at `list[i]`, a second
 * use of it being a bench.duplicate-id error there; `has` asks whether one was
 * claimed (for references to the list).
 */
function benchIds(list: string, what: string, errors: BenchError[]) {
  const ids = new Set<string>();
  return {
    claim(id: string, i: number, extra: { readonly deviceId?: string } = {}): void {
      if (ids.has(id))
        errors.push({
          kind: "bench.duplicate-id",
          path: `${list}[${i}].id`,
          message: `${what} id "${id}" is used twice`,
          ...extra,
        });
      ids.add(id);
    },
    has: (id: string): boolean => ids.has(id),
  };
}

function resolveBench(
  bench: Bench,
  options: LoadBenchOptions,
): Result<LoadedBench, readonly BenchError[]> {
  const lookupType = options.deviceTypes ?? getDeviceType;
  const errors: BenchError[] = [];

  // Lines.
  const lines: LoadedLine[] = [];
  const lineIds = benchIds("lines", "line", errors);
  bench.lines.forEach((line, i) => {
    lineIds.claim(line.id, i);
    const [area, lineNumber] = line.address.split(".").map(Number) as [number, number];
    if (area > 15 || lineNumber > 15) {
      errors.push({
        kind: "bench.address-invalid",
        path: `lines[${i}].address`,
        message: `line address "${line.address}": area and line are 0..15`,
      });
    }
    lines.push({ id: line.id, name: line.name, lineAddress: (area << 4) | lineNumber });
  });
  const lineFor = (individualAddress: number): string =>
    lines.find((l) => l.lineAddress === individualAddress >> 8)?.id ?? lines[0]!.id;

  // Test tool.
  const testTool = parseIndividualAddress(bench.testToolAddress);
  if (!testTool.ok)
    errors.push({
      kind: "bench.address-invalid",
      path: "testToolAddress",
      message: `testToolAddress: ${testTool.error.message}`,
    });
  const testToolAddress = testTool.ok ? testTool.value : 0;
  const usedIndividual = new Map<number, string>();
  if (testTool.ok) usedIndividual.set(testTool.value, "testToolAddress");

  // Group addresses.
  const groupAddresses = new Map<number, LoadedGroupAddress>();
  const groupAddressByText = new Map<string, LoadedGroupAddress>();
  bench.groupAddresses.forEach((ga, i) => {
    const raw = parseGroupAddress(ga.address);
    if (!raw.ok) {
      errors.push({
        kind: "bench.address-invalid",
        path: `groupAddresses[${i}].address`,
        message: `groupAddresses[${i}].address: ${raw.error.message}`,
        groupAddress: ga.address,
      });
      return;
    }
    const sizeBits = dptSizeBits(ga.dpt);
    if (sizeBits === undefined) {
      errors.push({
        kind: "bench.dpt-unknown",
        path: `groupAddresses[${i}].dpt`,
        message: `group address ${ga.address}: unknown DPT "${ga.dpt}"`,
        groupAddress: ga.address,
      });
      return;
    }
    if (groupAddresses.has(raw.value)) {
      errors.push({
        kind: "bench.duplicate-group-address",
        path: `groupAddresses[${i}].address`,
        message: `group address ${ga.address} is listed twice`,
        groupAddress: ga.address,
      });
      return;
    }
    const loaded: LoadedGroupAddress = {
      raw: raw.value,
      text: ga.address,
      name: ga.name,
      dpt: ga.dpt,
      sizeBits,
    };
    groupAddresses.set(raw.value, loaded);
    groupAddressByText.set(ga.address, loaded);
  });

  // Unit-link membership, needed by each device.
  const unitLinksOf = new Map<string, string[]>();
  const unitLinkIds = benchIds("unitLinks", "unit link", errors);
  bench.unitLinks.forEach((link, i) => {
    unitLinkIds.claim(link.id, i);
    link.members.forEach((member) =>
      unitLinksOf.set(member, [...(unitLinksOf.get(member) ?? []), link.id]),
    );
  });

  // Rooms.
  const rooms: LoadedRoom[] = [];
  const roomIds = benchIds("rooms", "room", errors);
  (bench.rooms ?? []).forEach((room, i) => {
    roomIds.claim(room.id, i);
    rooms.push({ id: room.id, name: room.name, spec: roomSpecOf(room) });
  });

  // Links grouped by device and object, in bench order (first = sending address).
  const linksOf = new Map<string, Map<number, { raw: number; index: number }[]>>();
  const deviceIds = new Set(bench.devices.map((d) => d.id));
  bench.links.forEach((link, i) => {
    const path = `links[${i}]`;
    if (!deviceIds.has(link.device)) {
      errors.push({
        kind: "bench.link-device-unknown",
        path: `${path}.device`,
        message: `${path}: no device "${link.device}"`,
        deviceId: link.device,
      });
      return;
    }
    const ga =
      groupAddressByText.get(link.groupAddress) ??
      lookupGroupAddress(link.groupAddress, groupAddresses);
    if (ga === undefined) {
      errors.push({
        kind: "bench.link-address-unknown",
        path: `${path}.groupAddress`,
        message: `${path}: group address ${link.groupAddress} is not in groupAddresses`,
        deviceId: link.device,
        object: link.object,
        groupAddress: link.groupAddress,
      });
      return;
    }
    const byObject =
      linksOf.get(link.device) ?? new Map<number, { raw: number; index: number }[]>();
    linksOf.set(link.device, byObject);
    const list = byObject.get(link.object) ?? [];
    if (list.some((l) => l.raw === ga.raw)) {
      errors.push({
        kind: "bench.link-duplicate",
        path,
        message: `${path}: object ${link.object} of "${link.device}" is already linked to ${link.groupAddress}`,
        deviceId: link.device,
        object: link.object,
        groupAddress: link.groupAddress,
      });
      return;
    }
    list.push({ raw: ga.raw, index: i });
    byObject.set(link.object, list);
  });

  // Devices.
  const devices: LoadedDevice[] = [];
  const seenDeviceIds = benchIds("devices", "device", errors);
  bench.devices.forEach((device, i) => {
    const path = `devices[${i}]`;
    seenDeviceIds.claim(device.id, i, { deviceId: device.id });
    if (device.room !== undefined && !roomIds.has(device.room))
      errors.push({
        kind: "bench.room-unknown",
        path: `${path}.room`,
        message: `device "${device.id}": no room "${device.room}" in rooms`,
        deviceId: device.id,
      });
    const type = lookupType(device.type);
    if (type === undefined) {
      errors.push({
        kind: "bench.device-type-unknown",
        path: `${path}.type`,
        message: `device "${device.id}": unknown device type "${device.type}"`,
        deviceId: device.id,
      });
      return;
    }
    const parameters = type.parameters.safeParse(device.parameters);
    if (!parameters.success) {
      errors.push(
        ...schemaErrors(
          parameters.error,
          ["devices", i, "parameters"],
          "bench.parameters-invalid",
          { deviceId: device.id },
        ),
      );
      return;
    }

    let individualAddress: number | undefined;
    let line: string | undefined;
    if (type.medium === "knx") {
      if (device.individualAddress === undefined) {
        errors.push({
          kind: "bench.individual-address-missing",
          path: `${path}.individualAddress`,
          message: `device "${device.id}" sits on the KNX line and needs an individual address`,
          deviceId: device.id,
        });
      } else {
        const ia = parseIndividualAddress(device.individualAddress);
        if (!ia.ok) {
          errors.push({
            kind: "bench.address-invalid",
            path: `${path}.individualAddress`,
            message: `device "${device.id}": ${ia.error.message}`,
            deviceId: device.id,
          });
        } else {
          const holder = usedIndividual.get(ia.value);
          if (holder !== undefined) {
            errors.push({
              kind: "bench.duplicate-individual-address",
              path: `${path}.individualAddress`,
              message: `device "${device.id}": individual address ${device.individualAddress} is already used by ${holder}`,
              deviceId: device.id,
            });
          }
          usedIndividual.set(ia.value, `device "${device.id}"`);
          individualAddress = ia.value;
        }
      }
      if (device.line !== undefined) {
        if (!lineIds.has(device.line))
          errors.push({
            kind: "bench.line-unknown",
            path: `${path}.line`,
            message: `device "${device.id}": no line "${device.line}"`,
            deviceId: device.id,
          });
        line = device.line;
      } else {
        line = individualAddress === undefined ? lines[0]!.id : lineFor(individualAddress);
      }
      if (type.id === COUPLER_TYPE_ID && individualAddress !== undefined) {
        const coupler = checkCouplerLines(path, device.id, individualAddress, lines, device.line);
        errors.push(...coupler.errors);
        line = coupler.line ?? line;
      }
    } else if (device.individualAddress !== undefined) {
      errors.push({
        kind: "bench.individual-address-unexpected",
        path: `${path}.individualAddress`,
        message: `device "${device.id}" (${type.id}) sits only on a unit link and has no individual address`,
        deviceId: device.id,
      });
    }

    const specs = type.groupObjects(parameters.data);
    const specByNumber = new Map(specs.map((s) => [s.number, s]));
    for (const key of Object.keys(device.objectFlags ?? {})) {
      if (!/^\d+$/.test(key) || !specByNumber.has(Number(key))) {
        errors.push({
          kind: "bench.object-unknown",
          path: `${path}.objectFlags.${key}`,
          message: `device "${device.id}" has no group object ${key}`,
          deviceId: device.id,
        });
      }
    }
    const deviceLinks =
      linksOf.get(device.id) ?? new Map<number, { raw: number; index: number }[]>();
    for (const [object, list] of deviceLinks) {
      if (!specByNumber.has(object)) {
        for (const l of list) {
          errors.push({
            kind: "bench.object-unknown",
            path: `links[${l.index}].object`,
            message: `links[${l.index}]: device "${device.id}" has no group object ${object}`,
            deviceId: device.id,
            object,
          });
        }
      }
    }
    const objects: LoadedObject[] = specs.map((spec) => {
      const sizeBits = dptSizeBits(spec.dpt);
      if (sizeBits === undefined)
        throw new Error(
          `device type "${type.id}" declares object ${spec.number} with unknown DPT "${spec.dpt}"`,
        );
      return {
        number: spec.number,
        spec,
        flags: { ...spec.flags, ...device.objectFlags?.[String(spec.number)] },
        dpt: spec.dpt,
        sizeBits,
        groupAddresses: (deviceLinks.get(spec.number) ?? []).map((l) => l.raw),
      };
    });
    devices.push({
      id: device.id,
      name: device.name,
      type,
      line,
      individualAddress,
      parameters: parameters.data,
      objects,
      unitLinks: unitLinksOf.get(device.id) ?? [],
      ...(device.room === undefined ? {} : { room: device.room }),
    });
  });

  // Unit link members must exist.
  const deviceById = new Map(devices.map((d) => [d.id, d]));
  bench.unitLinks.forEach((link, i) =>
    link.members.forEach((member, m) => {
      if (!deviceIds.has(member)) {
        errors.push({
          kind: "bench.unit-link-member-unknown",
          path: `unitLinks[${i}].members[${m}]`,
          message: `unit link "${link.id}": no device "${member}"`,
          deviceId: member,
        });
      }
    }),
  );

  // Every object on an address carries a value of the address's size.
  for (const device of devices) {
    for (const object of device.objects) {
      for (const raw of object.groupAddresses) {
        const ga = groupAddresses.get(raw)!;
        if (ga.sizeBits !== object.sizeBits) {
          errors.push({
            kind: "bench.address-size-mismatch",
            path: `devices[${bench.devices.findIndex((d) => d.id === device.id)}]`,
            message: `group address ${ga.text} carries ${ga.dpt} (${ga.sizeBits} bit) but object ${object.number} "${object.spec.name}" of "${device.id}" is ${object.dpt} (${object.sizeBits} bit)`,
            deviceId: device.id,
            object: object.number,
            groupAddress: ga.text,
          });
        }
      }
    }
  }

  if (errors.length > 0) return err(errors);
  return ok({
    bench,
    lines,
    testToolAddress,
    testToolLine: lineFor(testToolAddress),
    groupAddresses,
    devices,
    deviceById,
    unitLinks: bench.unitLinks,
    rooms,
  });
}

/**
 * What a bench room's thermal fields default to when left out, in the bench's
 * units (°C, kJ/K, W/K): engine/room's defaults (their sources are there) and a
 * 20 °C start, a usual indoor temperature (common practice, no published source).
 */
export const BENCH_ROOM_DEFAULTS = {
  initialC: 20,
  outdoorC: DEFAULT_OUTDOOR_C,
  heatCapacityKJPerK: DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K / 1000,
  envelopeUaWPerK: DEFAULT_ROOM_UA_W_PER_K,
} as const;

/** A bench room's physics, engine/room's defaults where the bench says nothing. */
function roomSpecOf(room: BenchRoom): RoomSpec {
  return {
    initialC: room.initialC ?? BENCH_ROOM_DEFAULTS.initialC,
    outdoorC: room.outdoorC ?? BENCH_ROOM_DEFAULTS.outdoorC,
    heatCapacityJPerK: (room.heatCapacityKJPerK ?? BENCH_ROOM_DEFAULTS.heatCapacityKJPerK) * 1000,
    envelopeUaWPerK: room.envelopeUaWPerK ?? BENCH_ROOM_DEFAULTS.envelopeUaWPerK,
  };
}

// Links may spell an address differently from the list ("1/257" vs "1/1/1"): fall back to the raw value.
function lookupGroupAddress(
  text: string,
  groupAddresses: ReadonlyMap<number, LoadedGroupAddress>,
): LoadedGroupAddress | undefined {
  const raw = parseGroupAddress(text);
  return raw.ok ? groupAddresses.get(raw.value) : undefined;
}
