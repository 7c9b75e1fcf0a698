import type { LoadedBench, LoadedDevice } from "../bench";
import { createRng } from "../core/rng";
import { Scheduler } from "../core/scheduler";
import { Trace, type TraceEvent } from "../core/trace";
import { SequentialIds } from "../core/ids";
import type {
  AnyDeviceType,
  DeviceEffect,
  DeviceEvent,
  TransitionResult,
} from "../devices/device-type";
import { dptSizeBits } from "../dpt";
import { ACK_OCTET } from "../frame";
import { DeviceRunner, type DeviceRuntime } from "./device-runtime";
import { FaultRegistry } from "./fault-registry";
import { RoomClimate } from "./room-climate";
import type { RoomSpec } from "../room";
import { GroupObjectLayer } from "./group-objects";
import { TraceEmitter } from "./trace-emitter";
import { UNIT_LINK_DELAY_US, UnitLinkMedium } from "./unit-link-medium";

/** A device on a device bench: its type and raw parameters (parsed with the type's schema). */
export interface DeviceBenchMember {
  readonly id: string;
  readonly type: AnyDeviceType;
  readonly parameters?: unknown;
  /** A room of the device bench's `rooms`; absent: the device's own room, if it needs one. */
  readonly room?: string;
}

/** A room shared by device-bench members. */
export interface DeviceBenchRoom {
  readonly id: string;
  readonly spec: RoomSpec;
}

/** A unit link between device-bench members; ids of non-members are ignored. */
export interface DeviceBenchLink {
  readonly id: string;
  readonly members: readonly string[];
}

/**
 * Devices with the real runtime and no KNX line: transitions, effects, timers,
 * the unit-link medium with its real delay, and the fault registry, on a
 * virtual clock. Group objects exist and hold values, but nothing reaches a
 * bus. Device tests drive it (test/harness/device-harness.ts); it is the same
 * code a simulation runs, not a copy.
 */
export class DeviceBench {
  readonly scheduler = new Scheduler(64);
  readonly trace = new Trace();
  private readonly runner: DeviceRunner;
  private readonly devices = new Map<string, DeviceRuntime>();
  /** The rooms of the bench: shared ones and each member's own. */
  readonly climate = new RoomClimate(this.scheduler);

  constructor(
    members: readonly DeviceBenchMember[],
    links: readonly DeviceBenchLink[],
    observeEffect?: (deviceId: string, effect: DeviceEffect) => void,
    rooms: readonly DeviceBenchRoom[] = [],
  ) {
    for (const room of rooms) this.climate.define(room.id, room.spec);
    const ids = new Set(members.map((m) => m.id));
    const unitLinks = links.map((l) => ({
      id: l.id,
      name: l.id,
      members: l.members.filter((m) => ids.has(m)),
    }));
    // Only what the runtime reads of a bench: unit links and group addresses (none).
    const bench = { unitLinks, groupAddresses: new Map() } as unknown as LoadedBench;
    const emitter = new TraceEmitter(this.trace, this.scheduler);
    const faults = new FaultRegistry(emitter, ids);
    const objects = new GroupObjectLayer(emitter, new SequentialIds(), () => bench);
    const medium = new UnitLinkMedium<DeviceRuntime>(
      this.scheduler,
      emitter,
      faults,
      () => bench,
      (id) => this.devices.get(id)!,
      UNIT_LINK_DELAY_US,
      (to, link, from, message) =>
        this.runner.transition(to, { kind: "link.receive", link, from, message }),
    );
    this.runner = new DeviceRunner(
      this.scheduler,
      createRng(1),
      emitter,
      faults,
      objects,
      () => medium,
      false,
      this.climate,
      observeEffect && ((device, effect) => observeEffect(device.id, effect)),
    );
    objects.receiver = this.runner;
    members.forEach((member, index) => {
      const loaded = loadedDevice(
        member.id,
        member.type,
        member.type.parameters.parse(member.parameters ?? {}),
        links,
        member.room,
      );
      this.devices.set(
        member.id,
        this.runner.create(index, loaded, undefined, undefined, ACK_OCTET),
      );
    });
  }

  /** Virtual time now, µs. */
  get nowUs(): number {
    return this.scheduler.nowUs;
  }

  /** Every trace event so far. */
  get events(): readonly TraceEvent[] {
    return this.trace.events();
  }

  /** Delivers `start` (and read-on-init reads, which go nowhere) to every device, in member order. */
  start(): void {
    for (const device of this.devices.values()) this.runner.start(device);
  }

  /** Hands an event to a device now; a group write or response is stored in its object first, as on the bus. */
  dispatch(deviceId: string, event: DeviceEvent): TransitionResult<unknown> {
    const device = this.device(deviceId);
    if (event.kind === "group.write" || event.kind === "group.response") {
      const object = device.objects.get(event.object);
      if (object !== undefined) device.values[object.slot] = event.value;
    }
    return this.runner.transition(device, event);
  }

  /** Runs everything due up to `untilUs`, then sets the clock there (never backwards). */
  runUntil(untilUs: number): void {
    if (untilUs <= this.scheduler.nowUs) return;
    this.scheduler.run(untilUs);
    this.scheduler.advanceTo(untilUs);
  }

  /** Gives a device new raw parameters without restarting it. */
  setParameters(deviceId: string, parameters: unknown): void {
    const device = this.device(deviceId);
    const parsed = device.type.parameters.parse(parameters);
    this.runner.reconfigure(device, { ...device.loaded, parameters: parsed });
  }

  /** A device's raw (parsed) parameters. */
  parameters(deviceId: string): unknown {
    return this.device(deviceId).loaded.parameters;
  }

  state(deviceId: string): unknown {
    return this.device(deviceId).state;
  }

  objectValue(deviceId: string, object: number): unknown {
    const device = this.device(deviceId);
    const spec = device.objects.get(object);
    return spec === undefined ? undefined : device.values[spec.slot];
  }

  private device(id: string): DeviceRuntime {
    const device = this.devices.get(id);
    if (device === undefined) throw new Error(`device bench has no device "${id}"`);
    return device;
  }
}

function loadedDevice(
  id: string,
  type: AnyDeviceType,
  parameters: unknown,
  links: readonly DeviceBenchLink[],
  room: string | undefined,
): LoadedDevice {
  return {
    id,
    name: id,
    type,
    // The address the device sees as its own; no line carries it.
    individualAddress: 0x1100,
    parameters,
    objects: type.groupObjects(parameters).map((spec) => ({
      number: spec.number,
      spec,
      flags: spec.flags,
      dpt: spec.dpt,
      sizeBits: dptSizeBits(spec.dpt) ?? 8,
      groupAddresses: [],
    })),
    unitLinks: links.filter((l) => l.members.includes(id)).map((l) => l.id),
    ...(room === undefined ? {} : { room }),
  };
}
