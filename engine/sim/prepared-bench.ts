import type { BenchError, LoadedBench, LoadedDevice } from "../bench";
import type { Result } from "../core/result";
import type { GroupObjectFlags, LocalButtonSpec } from "../devices/device-type";
import { getDpt, type DptCodec } from "../dpt";

/**
 * Work that depends only on a loaded bench, done once and kept beside it, so
 * starting a run (a scenario replay, a console reset) does not repeat it: the
 * group-object specs of each device with their codecs resolved, its local
 * buttons, which objects listen to each group address on each line, and the benches a
 * parameter change leads to (a parameter change re-checks the whole bench,
 * and a suite replays the same change many times).
 *
 * Everything kept is immutable and derived deterministically from the bench,
 * so sharing it between runs cannot change what a run does. Loaded benches are
 * the keys of weak maps: nothing is kept once a bench is no longer used.
 */

/**
 * A group object's fixed part, shared by every run of the bench; a run keeps
 * the stored values beside it, in an array indexed by `slot`.
 */
export interface ObjectSpec {
  /** Position among the device's objects: where a run keeps its stored value. */
  readonly slot: number;
  readonly number: number;
  readonly dpt: string;
  readonly codec: DptCodec<unknown>;
  readonly sizeBits: number;
  readonly flags: GroupObjectFlags;
  readonly groupAddresses: readonly number[];
}

const specsByDevice = new WeakMap<LoadedDevice, readonly ObjectSpec[]>();
const reloadsByBench = new WeakMap<
  LoadedBench,
  Map<string, Result<LoadedBench, readonly BenchError[]>>
>();

/** The object specs of a loaded device (kept when `reuse` is true). */
export function objectSpecs(device: LoadedDevice, reuse: boolean): readonly ObjectSpec[] {
  const kept = reuse ? specsByDevice.get(device) : undefined;
  if (kept !== undefined) return kept;
  const specs = device.objects.map((object, slot) => ({
    slot,
    number: object.number,
    dpt: object.dpt,
    codec: getDpt(object.dpt)!,
    sizeBits: object.sizeBits,
    flags: object.flags,
    groupAddresses: object.groupAddresses,
  }));
  if (reuse) specsByDevice.set(device, specs);
  return specs;
}

const specsByNumber = new WeakMap<LoadedDevice, ReadonlyMap<number, ObjectSpec>>();

/** A loaded device's object specs by object number (kept when `reuse` is true). */
export function objectSpecsByNumber(
  device: LoadedDevice,
  reuse: boolean,
): ReadonlyMap<number, ObjectSpec> {
  const kept = reuse ? specsByNumber.get(device) : undefined;
  if (kept !== undefined) return kept;
  const byNumber = new Map<number, ObjectSpec>();
  for (const spec of objectSpecs(device, reuse)) byNumber.set(spec.number, spec);
  if (reuse) specsByNumber.set(device, byNumber);
  return byNumber;
}

const buttonsByDevice = new WeakMap<LoadedDevice, readonly LocalButtonSpec[]>();

/** A loaded device's local buttons, which depend only on its parameters (kept when `reuse` is true). */
export function deviceButtons(device: LoadedDevice, reuse: boolean): readonly LocalButtonSpec[] {
  const kept = reuse ? buttonsByDevice.get(device) : undefined;
  if (kept !== undefined) return kept;
  const buttons = device.type.buttons(device.parameters);
  if (reuse) buttonsByDevice.set(device, buttons);
  return buttons;
}

const addressLinksByDevice = new WeakMap<LoadedDevice, readonly AddressLink[]>();

/** A group address a device listens to, with its objects linked to it (by number, in object order). */
export interface AddressLink {
  readonly groupAddress: number;
  readonly objects: readonly number[];
}

/** Which of a device's objects listen to each of its group addresses (kept when `reuse` is true). */
export function addressLinks(device: LoadedDevice, reuse: boolean): readonly AddressLink[] {
  const kept = reuse ? addressLinksByDevice.get(device) : undefined;
  if (kept !== undefined) return kept;
  const byAddress = new Map<number, number[]>();
  for (const spec of objectSpecs(device, reuse)) {
    for (const raw of spec.groupAddresses) {
      const list = byAddress.get(raw) ?? [];
      list.push(spec.number);
      byAddress.set(raw, list);
    }
  }
  const links = [...byAddress].map(([groupAddress, objects]) => ({ groupAddress, objects }));
  if (reuse) addressLinksByDevice.set(device, links);
  return links;
}

/** A device with objects listening to a group address: its position in the bench and those objects. */
export interface AddressListener {
  readonly deviceIndex: number;
  readonly objects: readonly ObjectSpec[];
}

/** Per line id: group address -> devices on that line with objects linked to it, in bench order. */
export type ListenerTables = ReadonlyMap<string, ReadonlyMap<number, readonly AddressListener[]>>;

const listenersByBench = new WeakMap<LoadedBench, ListenerTables>();

/**
 * Who listens to each group address on each line of a bench (kept when `reuse`
 * is true). Devices are named by their position in `bench.devices`, which is
 * also their position in a run, so every run of the bench shares the tables.
 */
export function listenerTables(bench: LoadedBench, reuse: boolean): ListenerTables {
  const kept = reuse ? listenersByBench.get(bench) : undefined;
  if (kept !== undefined) return kept;
  const tables = new Map<string, Map<number, AddressListener[]>>();
  for (const line of bench.lines) tables.set(line.id, new Map());
  bench.devices.forEach((device, deviceIndex) => {
    const table = device.line === undefined ? undefined : tables.get(device.line);
    if (table === undefined) return;
    const specs = objectSpecsByNumber(device, reuse);
    for (const link of addressLinks(device, reuse)) {
      const listener = { deviceIndex, objects: link.objects.map((number) => specs.get(number)!) };
      const list = table.get(link.groupAddress);
      if (list === undefined) table.set(link.groupAddress, [listener]);
      else list.push(listener);
    }
  });
  if (reuse) listenersByBench.set(bench, tables);
  return tables;
}

/**
 * The bench after giving `deviceId` new parameters: `load` computes it the
 * first time; later runs that make the same change from the same bench get the
 * same result (kept when `reuse` is true).
 */
export function reloadedBench(
  current: LoadedBench,
  deviceId: string,
  parameters: Readonly<Record<string, unknown>>,
  reuse: boolean,
  load: () => Result<LoadedBench, readonly BenchError[]>,
): Result<LoadedBench, readonly BenchError[]> {
  if (!reuse) return load();
  let reloads = reloadsByBench.get(current);
  if (reloads === undefined) {
    reloads = new Map();
    reloadsByBench.set(current, reloads);
  }
  const key = `${deviceId}\u0000${JSON.stringify(parameters)}`;
  let result = reloads.get(key);
  if (result === undefined) {
    result = load();
    reloads.set(key, result);
  }
  return result;
}
