import { formatGroupAddress, parseGroupAddress } from "../address";
import type { Bench, BenchDevice } from "../bench/bench-schema";
import { getDeviceType } from "../devices";
import type { AnyDeviceType, GroupObjectFlags, GroupObjectSpec } from "../devices/device-type";

/**
 * A read-only view of a bench document that the check rules share: device types
 * resolved, parameters with their defaults, objects with the bench's flag
 * overrides applied, and links grouped by group address. It tolerates broken
 * references (the bench loader reports those); rules simply skip what they
 * cannot resolve.
 */

export interface DeviceView {
  readonly device: BenchDevice;
  /** Undefined when the type id is not in the catalogue. */
  readonly type: AnyDeviceType | undefined;
  /**
   * Parameters with defaults filled. When the document's parameters do not
   * parse (e.g. inverted limits a rule wants to report), the written values are
   * laid over the type's defaults, so rules still see what the person wrote.
   */
  readonly parameters: Record<string, unknown>;
  /** Whether the written parameters passed the type's schema. */
  readonly parametersValid: boolean;
  /** Group objects for these parameters, with flag overrides applied. */
  readonly objects: readonly GroupObjectSpec[];
}

/** One object's membership of a group address. */
export interface AddressMember {
  readonly device: string;
  readonly object: number;
  /** Undefined when the device has no such object (a broken link). */
  readonly spec: GroupObjectSpec | undefined;
  /** The first link of an object is the address it sends on. */
  readonly sending: boolean;
}

export interface AddressView {
  readonly raw: number;
  /** Three-level text ("1/0/1"). */
  readonly text: string;
  readonly name: string | undefined;
  readonly dpt: string | undefined;
  readonly members: readonly AddressMember[];
}

export interface BenchView {
  readonly bench: Bench;
  readonly devices: ReadonlyMap<string, DeviceView>;
  /** Declared addresses and addresses that appear only in links, by raw value. */
  readonly addresses: ReadonlyMap<number, AddressView>;
  /** Links per device and object number, in document order. */
  readonly linksOf: (device: string, object: number) => readonly number[];
}

function effectiveParameters(type: AnyDeviceType | undefined, written: Record<string, unknown>) {
  if (type === undefined) return { parameters: written, parametersValid: true };
  const parsed = type.parameters.safeParse(written);
  if (parsed.success)
    return { parameters: parsed.data as Record<string, unknown>, parametersValid: true };
  const defaults = type.parameters.safeParse({});
  const base = defaults.success ? (defaults.data as Record<string, unknown>) : {};
  return { parameters: { ...base, ...written }, parametersValid: false };
}

function objectsOf(
  type: AnyDeviceType | undefined,
  device: BenchDevice,
  parameters: Record<string, unknown>,
  valid: boolean,
) {
  if (type === undefined) return [];
  let specs: readonly GroupObjectSpec[];
  try {
    specs = type.groupObjects(valid ? parameters : type.parameters.parse({}));
  } catch {
    // A type may assume parsed parameters; without them the objects are unknown.
    return [];
  }
  const overrides = device.objectFlags ?? {};
  return specs.map((spec) => {
    const override = overrides[String(spec.number)];
    if (override === undefined) return spec;
    const flags: GroupObjectFlags = { ...spec.flags, ...override };
    return { ...spec, flags };
  });
}

export function benchView(bench: Bench): BenchView {
  const devices = new Map<string, DeviceView>();
  for (const device of bench.devices) {
    const type = getDeviceType(device.type);
    const { parameters, parametersValid } = effectiveParameters(type, device.parameters);
    devices.set(device.id, {
      device,
      type,
      parameters,
      parametersValid,
      objects: objectsOf(type, device, parameters, parametersValid),
    });
  }

  const addresses = new Map<
    number,
    {
      raw: number;
      text: string;
      name: string | undefined;
      dpt: string | undefined;
      members: AddressMember[];
    }
  >();
  const entry = (raw: number) => {
    let view = addresses.get(raw);
    if (view === undefined) {
      view = { raw, text: formatGroupAddress(raw), name: undefined, dpt: undefined, members: [] };
      addresses.set(raw, view);
    }
    return view;
  };
  for (const declared of bench.groupAddresses) {
    const parsed = parseGroupAddress(declared.address);
    if (!parsed.ok) continue;
    const view = entry(parsed.value);
    view.name = declared.name;
    view.dpt = declared.dpt;
  }

  const links = new Map<string, number[]>();
  for (const link of bench.links) {
    const parsed = parseGroupAddress(link.groupAddress);
    if (!parsed.ok) continue;
    const key = `${link.device}#${link.object}`;
    const list = links.get(key) ?? [];
    if (list.includes(parsed.value)) continue;
    list.push(parsed.value);
    links.set(key, list);
    const spec = devices.get(link.device)?.objects.find((object) => object.number === link.object);
    entry(parsed.value).members.push({
      device: link.device,
      object: link.object,
      spec,
      sending: list.length === 1,
    });
  }

  return {
    bench,
    devices,
    addresses,
    linksOf: (device, object) => links.get(`${device}#${object}`) ?? [],
  };
}
