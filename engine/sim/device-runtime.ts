import type { LoadedDevice } from "../bench";
import type { Rng } from "../core/rng";
import type { Scheduler } from "../core/scheduler";
import {
  STARTUP_DONE_TIMER,
  type AnyDeviceType,
  type DeviceContext,
  type DeviceEffect,
  type DeviceEvent,
  type TransitionResult,
} from "../devices/device-type";
import { NO_ACK_OCTET, type Tp1Sender } from "../bus";
import { DeviceTimers } from "./device-timers";
import type { FaultRegistry } from "./fault-registry";
import {
  buildObjects,
  type GroupObjectLayer,
  type LineRuntime,
  type ObjectOwner,
  type ObjectRuntime,
} from "./group-objects";
import type { RoomClimate } from "./room-climate";
import type { TraceEmitter } from "./trace-emitter";
import type { UnitLinkMedium } from "./unit-link-medium";

/** The runtime's own timer that ends a device's start-up delay; the device then gets it as a timer event. */
const STARTUP_TIMER = STARTUP_DONE_TIMER;

/**
 * Spread of start-up sends by device number, µs per number: the low octet of
 * the individual address times 50 ms, about two short telegrams' time on the
 * line (Basic course: ~20 ms each), so the devices of a line start one after
 * another instead of all at once after a bus power return (up to 12.75 s for
 * device 255). Deriving the spread from the address is common practice, no
 * published source.
 */
export const STARTUP_STAGGER_US_PER_DEVICE = 50_000;

/** A running device: its state machine, objects, timers and bus connection. */
export interface DeviceRuntime extends ObjectOwner {
  readonly index: number;
  readonly id: string;
  loaded: LoadedDevice;
  readonly type: AnyDeviceType;
  state: unknown;
  objects: ReadonlyMap<number, ObjectRuntime>;
  values: unknown[];
  context: DeviceContext<unknown>;
  readonly line: LineRuntime | undefined;
  readonly sender: Tp1Sender | undefined;
  busAnswer: number;
  /** Timer name -> generation of the live timer. */
  readonly timers: DeviceTimers;
  lastTakenTelegramId: number;
  /** The room the device reads and drives (a bench room or its own); undefined: none. */
  roomId: string | undefined;
  /** During a start-up delay: the objects the device has sent since power returned (not sent again). */
  sentDuringStartup: Set<number> | undefined;
}

/**
 * A running device as the runtime keeps it for the whole run: a class, not a
 * literal (engine/core/run-objects.ts). Its context is set right after
 * construction, as it refers back to the device.
 */
class RunningDevice implements DeviceRuntime {
  readonly id: string;
  readonly type: AnyDeviceType;
  context: DeviceContext<unknown> = undefined as unknown as DeviceContext<unknown>;
  lastTakenTelegramId = -1;
  roomId: string | undefined = undefined;
  sentDuringStartup: Set<number> | undefined = undefined;

  constructor(
    readonly index: number,
    public loaded: LoadedDevice,
    readonly line: LineRuntime | undefined,
    readonly sender: Tp1Sender | undefined,
    public state: unknown,
    public objects: ReadonlyMap<number, ObjectRuntime>,
    public values: unknown[],
    public busAnswer: number,
    readonly timers: DeviceTimers,
  ) {
    this.id = loaded.id;
    this.type = loaded.type;
  }
}

/**
 * What a device's transition may read: a class rather than an object of
 * closures, since every run builds one per device and a restart builds another.
 * Its methods are not bound: devices call them on the context, as
 * `context.objectValue(n)` and `context.random()`.
 */
class RuntimeContext implements DeviceContext<unknown> {
  readonly deviceId: string;
  readonly individualAddress: number;
  readonly parameters: unknown;
  readonly links: readonly string[];

  constructor(
    private readonly device: DeviceRuntime,
    private readonly scheduler: Scheduler,
    private readonly rng: Rng,
    private readonly climate: RoomClimate,
  ) {
    this.deviceId = device.id;
    // Unit-link-only devices have no address; they see the unprogrammed default 15.15.255.
    this.individualAddress = device.loaded.individualAddress ?? 0xffff;
    this.parameters = device.loaded.parameters;
    this.links = device.loaded.unitLinks;
  }

  get nowUs(): number {
    return this.scheduler.nowUs;
  }

  objectValue(object: number): unknown {
    const spec = this.device.objects.get(object);
    return spec === undefined ? undefined : this.device.values[spec.slot];
  }

  random(): number {
    return this.rng.next();
  }

  roomTemperatureC(): number | undefined {
    const room = this.device.roomId;
    return room === undefined ? undefined : this.climate.temperatureC(room);
  }

  roomOutdoorC(): number | undefined {
    const room = this.device.roomId;
    return room === undefined ? undefined : this.climate.outdoorC(room);
  }
}

/**
 * The device runtime: drives each device's pure transition and applies the
 * effects it asks for.
 *
 * - group.send / group.read / object.store: through the group-object layer.
 * - timer.set / timer.cancel: a named timer per device; setting a name again
 *   replaces it, a restart drops them all.
 * - link.send: through the unit-link medium.
 * - fault.raise / fault.clear: in the fault registry, as raised by the device.
 * - note: traced.
 */
export class DeviceRunner {
  /** Scheduler tag of device timers. */
  readonly timerTag: number;
  private timerGeneration = 0;

  constructor(
    private readonly scheduler: Scheduler,
    private readonly rng: Rng,
    private readonly emitter: TraceEmitter,
    private readonly faults: FaultRegistry,
    private readonly objects: GroupObjectLayer,
    private readonly links: () => UnitLinkMedium<DeviceRuntime>,
    private readonly reuse: boolean,
    private readonly climate: RoomClimate,
    /** Sees every effect before it is applied (test support); absent in a simulation. */
    private readonly observeEffect?: (device: DeviceRuntime, effect: DeviceEffect) => void,
  ) {
    // A queued timer is its generation (arg) and its device (payload); the name and data
    // stay in the device's timers, so setting a timer allocates nothing here.
    this.timerTag = scheduler.register((generation, payload) =>
      this.onTimer(payload as DeviceRuntime, generation),
    );
  }

  /** A device at its initial state, not yet started. */
  create(
    index: number,
    loaded: LoadedDevice,
    line: LineRuntime | undefined,
    sender: Tp1Sender | undefined,
    busAnswer: number,
  ): DeviceRuntime {
    const { objects, values } = buildObjects(loaded, this.reuse);
    const device = new RunningDevice(
      index,
      loaded,
      line,
      sender,
      loaded.type.initialState(loaded.parameters),
      objects,
      values,
      busAnswer,
      new DeviceTimers(),
    );
    device.roomId = this.placeInRoom(device);
    device.context = this.makeContext(device);
    return device;
  }

  /**
   * The room a device reads: the bench room it names, else a room of its own
   * built from its parameters (kept when it already exists: a download does not
   * change the air temperature), else none.
   */
  private placeInRoom(device: DeviceRuntime): string | undefined {
    if (device.loaded.room !== undefined) return device.loaded.room;
    const own = device.type.privateRoom?.(device.loaded.parameters);
    if (own === undefined) return undefined;
    const id = `device:${device.id}`;
    this.climate.define(id, own);
    return id;
  }

  /**
   * A device of another run as it stands (state, stored values, timers), for a
   * forked run. States and values are never changed in place, so they are
   * shared, and so are the object specs; the containers are copied.
   */
  copy(
    original: DeviceRuntime,
    line: LineRuntime | undefined,
    sender: Tp1Sender | undefined,
  ): DeviceRuntime {
    const device = new RunningDevice(
      original.index,
      original.loaded,
      line,
      sender,
      original.state,
      original.objects,
      original.values.slice(),
      original.busAnswer,
      original.timers.copy(),
    );
    device.lastTakenTelegramId = original.lastTakenTelegramId;
    device.roomId = original.roomId;
    if (original.sentDuringStartup !== undefined)
      device.sentDuringStartup = new Set(original.sentDuringStartup);
    device.context = this.makeContext(device);
    return device;
  }

  /** Continues `other`'s timer numbering, for a forked run. */
  copyTimerGeneration(other: DeviceRunner): void {
    this.timerGeneration = other.timerGeneration;
  }

  /** The fork's copy of a queued timer of another run: the fork's device (its generation is the event's arg). */
  copyTimer(payload: unknown, device: (original: DeviceRuntime) => DeviceRuntime): DeviceRuntime {
    return device(payload as DeviceRuntime);
  }

  /**
   * The `start` event, then the device's start-up sequence: at once for a type
   * without a start-up delay (read-on-init reads only), else after its delay
   * plus its place in the line's stagger (see `powerReturn`).
   */
  start(device: DeviceRuntime): void {
    this.transition(device, { kind: "start" });
    this.powerReturn(device);
  }

  /**
   * Bus power has returned to a device (its first start, or a cleared
   * "bus.silent"): after its start-up delay and its stagger it sends each
   * status or output object with the transmit flag once, with the value it
   * holds (unless the device sent it itself since power returned), then reads
   * its read-on-init objects. A device that reports nothing
   * at start-up (no `startupDelayS`) only reads.
   */
  powerReturn(device: DeviceRuntime): void {
    const delayS = device.type.startupDelayS?.(device.loaded.parameters);
    // Off a line (a device bench) there is no bus whose power returns, and nowhere to send.
    if (delayS === undefined || device.line === undefined) {
      this.readOnInit(device);
      return;
    }
    const staggerUs =
      ((device.loaded.individualAddress ?? 0) & 0xff) * STARTUP_STAGGER_US_PER_DEVICE;
    device.sentDuringStartup = new Set();
    const generation = ++this.timerGeneration;
    device.timers.set(STARTUP_TIMER, generation);
    this.scheduler.schedule(
      this.scheduler.nowUs + Math.round(delayS * 1_000_000) + staggerUs,
      this.timerTag,
      generation,
      device,
    );
  }

  /** The end of the start-up delay: statuses once, then read-on-init reads. */
  private startupDone(device: DeviceRuntime): void {
    // Still cut off: the sequence runs again when "bus.silent" is cleared.
    if (device.busAnswer === NO_ACK_OCTET) return;
    const alreadySent = device.sentDuringStartup;
    device.sentDuringStartup = undefined;
    this.emitter.deviceNote(device.id, "start-up: statuses sent, read-on-init objects read");
    for (const object of device.objects.values()) {
      const flags = object.flags;
      const value = device.values[object.slot];
      if (!flags.communication || !flags.transmit || value === undefined) continue;
      if (alreadySent?.has(object.number)) continue; // sent once already since power returned
      // Specs are built in the loaded device's object order, so the slot finds it without a search.
      const atSlot = device.loaded.objects[object.slot];
      const role = (
        atSlot?.number === object.number
          ? atSlot
          : device.loaded.objects.find((o) => o.number === object.number)
      )?.spec.role;
      if (role === "status" || role === "output") this.objects.send(device, object, value, "write");
    }
    this.transition(device, { kind: "timer", name: STARTUP_TIMER });
    this.readOnInit(device);
  }

  private readOnInit(device: DeviceRuntime): void {
    for (const object of device.objects.values()) {
      if (object.flags.readOnInit && object.flags.communication)
        this.objects.queueRead(device, object);
    }
  }

  /**
   * A restart after a parameter download: initial state, empty objects, no
   * timers, the faults the device raised itself cleared (injected ones stay).
   * The caller rebuilds the listener tables, then calls `start`.
   */
  reset(device: DeviceRuntime, loaded: LoadedDevice): void {
    device.loaded = loaded;
    const { objects, values } = buildObjects(loaded, this.reuse);
    device.objects = objects;
    device.values = values;
    device.context = this.makeContext(device);
    device.state = device.type.initialState(loaded.parameters);
    device.timers.clear();
    device.sentDuringStartup = undefined;
    device.lastTakenTelegramId = -1;
    this.faults.clearRaisedByDevice(device.id);
    this.climate.release(device.id);
    device.roomId = this.placeInRoom(device);
  }

  /**
   * New parameters without a restart, for devices that read their parameters
   * live (the device test harness); a bench download goes through `reset`.
   */
  reconfigure(device: DeviceRuntime, loaded: LoadedDevice): void {
    device.loaded = loaded;
    device.context = this.makeContext(device);
  }

  /** Hands one event to a device and applies the effects of its transition; returns the transition's result. */
  transition(device: DeviceRuntime, event: DeviceEvent): TransitionResult<unknown> {
    const result = device.type.transition(device.state, event, device.context);
    device.state = result.state;
    if (result.transition !== undefined && this.emitter.active)
      this.emitter.deviceTransition(device.id, result.transition, event.kind);
    const effects = result.effects;
    const observe = this.observeEffect;
    if (observe === undefined) {
      for (let i = 0; i < effects.length; i++) this.applyEffect(device, effects[i]!);
    } else {
      for (let i = 0; i < effects.length; i++) {
        observe(device, effects[i]!);
        this.applyEffect(device, effects[i]!);
      }
    }
    return result;
  }

  private makeContext(device: DeviceRuntime): DeviceContext<unknown> {
    return new RuntimeContext(device, this.scheduler, this.rng, this.climate);
  }

  private applyEffect(device: DeviceRuntime, effect: DeviceEffect): void {
    switch (effect.kind) {
      case "group.send":
        device.sentDuringStartup?.add(effect.object);
        this.objects.send(
          device,
          this.objectOf(device, effect.object, effect.kind),
          effect.value,
          effect.service,
        );
        return;
      case "group.read": {
        const object = this.objectOf(device, effect.object, effect.kind);
        if (object.flags.communication) this.objects.queueRead(device, object);
        return;
      }
      case "object.store":
        this.objects.store(
          device,
          this.objectOf(device, effect.object, effect.kind),
          effect.value,
          "store",
          undefined,
        );
        return;
      case "timer.set": {
        if (!Number.isSafeInteger(effect.delayUs) || effect.delayUs < 0) {
          throw new Error(
            `device "${device.id}" timer "${effect.name}": delayUs ${effect.delayUs} is not a non-negative integer`,
          );
        }
        const generation = ++this.timerGeneration;
        device.timers.set(effect.name, generation, effect.data);
        this.scheduler.schedule(
          this.scheduler.nowUs + effect.delayUs,
          this.timerTag,
          generation,
          device,
        );
        return;
      }
      case "timer.cancel":
        device.timers.delete(effect.name);
        return;
      case "link.send":
        this.links().send(device, effect.link, effect.message);
        return;
      case "fault.raise":
        this.faults.raise(device.id, effect.fault, "device", effect.text);
        return;
      case "fault.clear":
        this.faults.clear(device.id, effect.fault, "device");
        return;
      case "note":
        this.emitter.deviceNote(device.id, effect.text);
        return;
      case "room.drive":
        if (device.roomId !== undefined) this.climate.drive(device.roomId, device.id, effect);
        return;
    }
  }

  private objectOf(device: DeviceRuntime, number: number, effect: string): ObjectRuntime {
    const object = device.objects.get(number);
    if (object === undefined)
      throw new Error(
        `device "${device.id}" (${device.type.id}) asked for ${effect} on object ${number}, which it does not have`,
      );
    return object;
  }

  private onTimer(device: DeviceRuntime, generation: number): void {
    // Generations are unique in a run, so a timer still set with this one is the one queued.
    const index = device.timers.indexOfGeneration(generation);
    if (index < 0) return; // replaced, cancelled or restarted
    const name = device.timers.nameAt(index);
    const data = device.timers.dataAt(index);
    device.timers.delete(name);
    if (name === STARTUP_TIMER) {
      this.startupDone(device);
      return;
    }
    this.emitter.timerFired(device.id, name);
    this.transition(
      device,
      data === undefined ? { kind: "timer", name } : { kind: "timer", name, data },
    );
  }
}
