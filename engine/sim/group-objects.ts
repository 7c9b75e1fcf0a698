import type { LoadedBench, LoadedDevice } from "../bench";
import type { SequentialIds } from "../core/ids";
import type { DeviceEvent } from "../devices/device-type";
import { getDpt } from "../dpt";
import {
  ACK_OCTET,
  DEFAULT_HOP_COUNT,
  type DataFrame,
  type GroupService,
  type Priority,
} from "../frame";
import { NO_ACK_OCTET, type Tp1Line, type Tp1Sender, type Telegram } from "../bus";
import {
  listenerTables,
  objectSpecs,
  objectSpecsByNumber,
  type AddressListener,
  type ObjectSpec,
} from "./prepared-bench";
import { BUS_FAULTS } from "./fault-registry";
import type { TraceEmitter } from "./trace-emitter";

/**
 * The group-object layer: what a device's objects do with group telegrams.
 *
 * A device takes a group frame (and acknowledges it) when any of its objects is
 * linked to the destination. A write is stored in every linked object with the
 * communication and write flags and handed to the device; a response likewise
 * for the update flag; a read is answered for every linked object with the
 * communication and read flags, from the stored value (all-zero octets when the
 * object never had one, as a device's memory would hold). A device does not
 * hear its own frames. A device that took a frame acknowledges but ignores its
 * repetitions, even when other frames pass in between (exactly once per device,
 * a little stricter than devices that only compare with the last frame they
 * received). Sending goes out on the object's first linked address.
 */

/** Priority of group telegrams unless asked otherwise (knx-reference.md: low is the default). */
export const DEFAULT_GROUP_PRIORITY: Priority = "low";

/** A group object of a running device: its fixed spec; the run keeps its value in the device's `values[slot]`. */
export type ObjectRuntime = ObjectSpec;

/** What the group-object layer needs of a running device. */
export interface ObjectOwner {
  readonly id: string;
  /** The device as loaded from the bench (replaced by a parameter change). */
  readonly loaded: LoadedDevice;
  /** The device's object specs by number, shared by every run of the bench. */
  objects: ReadonlyMap<number, ObjectRuntime>;
  /** Stored object values of this run, by object slot (undefined before a value). */
  values: unknown[];
  readonly line: LineRuntime | undefined;
  readonly sender: Tp1Sender | undefined;
  /** Acknowledgement answered while a bus fault is active: ACK, BUSY, NAK, or NO_ACK_OCTET when silent. */
  busAnswer: number;
  lastTakenTelegramId: number;
}

/** One bench line: its TP1 model and who listens to each group address on it. */
export interface LineRuntime {
  readonly id: string;
  line: Tp1Line;
  /** Group address -> devices (by index) with objects linked to it, in bench order; shared by runs of the bench. */
  listeners: ReadonlyMap<number, readonly AddressListener[]>;
  /** Coupler sides on this line (engine/sim/couplers); they hear every frame. Absent when none. */
  couplers?: readonly { receive(telegram: Telegram, repeated: boolean): number }[];
  /** Who answers an individually addressed frame on this line (engine/sim/couplers); absent: nobody. */
  receiveIndividual?: (telegram: Telegram, repeated: boolean) => number;
}

const EMPTY_PAYLOAD: Uint8Array = new Uint8Array(0);
const NO_LISTENERS: ReadonlyMap<number, readonly AddressListener[]> = new Map();

/**
 * A line of a run as the simulation keeps it: a class, not a literal
 * (engine/core/run-objects.ts). Its TP1 model is set right after construction,
 * as the model's host refers back to the line; its listeners come with the
 * first `rebuildListeners`.
 */
export class RunningLine implements LineRuntime {
  line: Tp1Line = undefined as unknown as Tp1Line;
  listeners: ReadonlyMap<number, readonly AddressListener[]> = NO_LISTENERS;
  couplers: LineRuntime["couplers"] = undefined;
  receiveIndividual: LineRuntime["receiveIndividual"] = undefined;

  constructor(readonly id: string) {}
}

/** A device's objects by number (shared specs) and a fresh array of values, all empty. */
export function buildObjects(
  loaded: LoadedDevice,
  reuse: boolean,
): { objects: ReadonlyMap<number, ObjectRuntime>; values: unknown[] } {
  const values: unknown[] = [];
  for (let i = 0; i < objectSpecs(loaded, reuse).length; i++) values.push(undefined);
  return { objects: objectSpecsByNumber(loaded, reuse), values };
}

/** A group data frame as the runtime sends it (standard hop count, not repeated). */
export function groupFrame(
  source: number,
  destination: number,
  service: GroupService,
  payload: Uint8Array,
  sizeBits: number,
  priority: Priority,
): DataFrame {
  return {
    priority,
    repeated: false,
    source,
    destination,
    addressType: "group",
    hopCount: DEFAULT_HOP_COUNT,
    service,
    payload,
    shortPayload: service !== "GroupValue_Read" && sizeBits <= 6,
  };
}

/** Equality for DPT values: primitives, and flat objects such as {control, value} or {r, g, b}. */
function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a !== "object" || typeof b !== "object" || a === null || b === null) return false;
  const keysA = Object.keys(a);
  if (keysA.length !== Object.keys(b).length) return false;
  for (const key of keysA)
    if ((a as Record<string, unknown>)[key] !== (b as Record<string, unknown>)[key]) return false;
  return true;
}

export class GroupObjectLayer {
  /** Group-telegram deliveries so far (writes and responses handed to a device). */
  deliveries = 0;
  /** Last decoded value per raw group address. */
  readonly groupValues = new Map<number, unknown>();

  // Decode cache for the frame being delivered: listeners of one DPT share one decode.
  private decodedTelegramId = -1;
  private decodedDpt = "";
  private decodedValue: unknown = undefined;
  private decodedOk = false;

  constructor(
    private readonly emitter: TraceEmitter,
    private readonly telegramIds: SequentialIds,
    private readonly bench: () => LoadedBench,
    /** Reuse bench-only work across runs (see SimulationOptions.reuse). */
    private readonly reuse = true,
  ) {}

  /** The run's devices in bench order, as the listener tables number them. */
  private devices: readonly ObjectOwner[] = [];

  /** Where delivered writes and responses go: the device runtime (set once, right after construction). */
  receiver: { transition(device: ObjectOwner, event: DeviceEvent): unknown } | undefined;

  /** Takes over `other`'s counts, last group values and decode cache, for a forked run. */
  copyFrom(other: GroupObjectLayer): void {
    this.deliveries = other.deliveries;
    this.groupValues.clear();
    for (const [address, value] of other.groupValues) this.groupValues.set(address, value);
    this.decodedTelegramId = other.decodedTelegramId;
    this.decodedDpt = other.decodedDpt;
    this.decodedValue = other.decodedValue;
    this.decodedOk = other.decodedOk;
  }

  /**
   * Points every line at its listener table for `bench` (start, parameter
   * change) and takes the run's devices, in bench order, to resolve them.
   */
  rebuildListeners(
    lines: Iterable<LineRuntime>,
    bench: LoadedBench,
    devices: readonly ObjectOwner[],
  ): void {
    const tables = listenerTables(bench, this.reuse);
    for (const line of lines) line.listeners = tables.get(line.id) ?? NO_LISTENERS;
    this.devices = devices;
  }

  /** Stores a value in an object; traced when it changed. */
  store(
    device: ObjectOwner,
    object: ObjectRuntime,
    value: unknown,
    cause: "write" | "response" | "send" | "store",
    groupAddress: number | undefined,
  ): void {
    const previous = device.values[object.slot];
    if (sameValue(previous, value)) return;
    device.values[object.slot] = value;
    if (this.emitter.active)
      this.emitter.objectChanged(device.id, object.number, value, previous, cause, groupAddress);
  }

  /** A device sends a group value from an object (stored first; sent with the communication and transmit flags). */
  send(
    device: ObjectOwner,
    object: ObjectRuntime,
    value: unknown,
    service: "write" | "response",
  ): void {
    this.store(device, object, value, "send", object.groupAddresses[0]);
    if (!object.flags.communication || !object.flags.transmit) return;
    const destination = object.groupAddresses[0];
    if (destination === undefined) return;
    const encoded = object.codec.encode(value);
    if (!encoded.ok)
      throw new Error(`device "${device.id}" object ${object.number}: ${encoded.error.message}`);
    this.queueFromDevice(
      device,
      service === "write" ? "GroupValue_Write" : "GroupValue_Response",
      destination,
      encoded.value,
      object.sizeBits,
    );
  }

  /** Queues a frame from a device; undefined when it cannot send (no line, or disconnected). */
  queueFromDevice(
    device: ObjectOwner,
    service: GroupService,
    destination: number,
    payload: Uint8Array,
    sizeBits: number,
    priority: Priority = DEFAULT_GROUP_PRIORITY,
  ): number | undefined {
    if (device.sender === undefined || device.line === undefined) return undefined; // unit-link-only device
    if (device.busAnswer === NO_ACK_OCTET) {
      this.emitter.deviceNote(
        device.id,
        `not sent: "${BUS_FAULTS.silent}" disconnects the device from the line`,
      );
      return undefined;
    }
    const frame = groupFrame(
      device.sender.individualAddress,
      destination,
      service,
      payload,
      sizeBits,
      priority,
    );
    return device.line.line.queue(device.sender, frame, this.telegramIds.next()).id;
  }

  /** A GroupValue_Read on the object's first address (transmit flag required). */
  queueRead(device: ObjectOwner, object: ObjectRuntime): void {
    if (!object.flags.transmit) return;
    const destination = object.groupAddresses[0];
    if (destination === undefined) return;
    this.queueFromDevice(device, "GroupValue_Read", destination, EMPTY_PAYLOAD, object.sizeBits);
  }

  /** End of a frame on a line: acknowledge, take, store, hand to devices. Returns the wired-AND acknowledgement. */
  receiveFrame(line: LineRuntime, telegram: Telegram, repeated: boolean): number {
    const frame = telegram.frame;
    if (frame.addressType !== "group")
      return line.receiveIndividual?.(telegram, repeated) ?? NO_ACK_OCTET;
    const destination = frame.destination;
    const service = frame.service;
    if (telegram.transmissions === 1 && service !== "GroupValue_Read")
      this.recordGroupValue(destination, frame.payload);
    let answer = NO_ACK_OCTET;
    const couplers = line.couplers;
    if (couplers !== undefined)
      for (let i = 0; i < couplers.length; i++) answer &= couplers[i]!.receive(telegram, repeated);
    const listeners = line.listeners.get(destination);
    if (listeners === undefined) return answer;
    const senderDeviceId = telegram.sender.deviceId;
    const devices = this.devices;
    for (let i = 0; i < listeners.length; i++) {
      const listener = listeners[i]!;
      const device = devices[listener.deviceIndex]!;
      const objects = listener.objects;
      if (device.id === senderDeviceId) continue;
      const busAnswer = device.busAnswer;
      if (busAnswer !== ACK_OCTET) {
        answer &= busAnswer; // NO_ACK_OCTET (silent) leaves the line alone
        continue;
      }
      answer &= ACK_OCTET;
      // Already took an earlier transmission of this telegram: acknowledge, ignore.
      if (
        repeated &&
        (device.lastTakenTelegramId === telegram.id || telegram.takenBy?.includes(device) === true)
      )
        continue;
      device.lastTakenTelegramId = telegram.id;
      for (let j = 0; j < objects.length; j++)
        this.deliver(device, objects[j]!, telegram, destination, service);
    }
    if (answer !== ACK_OCTET) {
      // A repetition will follow. Frames from other senders may pass in between and
      // overwrite `lastTakenTelegramId`, so remember on the telegram who took this one.
      for (let i = 0; i < listeners.length; i++) {
        const device = devices[listeners[i]!.deviceIndex]!;
        if (device.lastTakenTelegramId !== telegram.id) continue;
        const takenBy = (telegram.takenBy ??= []);
        if (!takenBy.includes(device)) takenBy.push(device);
      }
    }
    return answer;
  }

  private deliver(
    device: ObjectOwner,
    object: ObjectRuntime,
    telegram: Telegram,
    destination: number,
    service: GroupService,
  ): void {
    const flags = object.flags;
    if (!flags.communication) return;
    if (service === "GroupValue_Read") {
      if (!flags.read) return;
      let payload: Uint8Array;
      const stored = device.values[object.slot];
      if (stored === undefined)
        payload = new Uint8Array(object.sizeBits <= 6 ? 1 : Math.ceil(object.sizeBits / 8));
      else {
        const encoded = object.codec.encode(stored);
        if (!encoded.ok)
          throw new Error(
            `device "${device.id}" object ${object.number} holds a value its DPT refuses: ${encoded.error.message}`,
          );
        payload = encoded.value;
      }
      this.queueFromDevice(device, "GroupValue_Response", destination, payload, object.sizeBits);
      return;
    }
    const isWrite = service === "GroupValue_Write";
    if (isWrite ? !flags.write : !flags.update) return;
    if (this.decodedTelegramId !== telegram.id || this.decodedDpt !== object.dpt) {
      const decoded = object.codec.decode(telegram.frame.payload);
      this.decodedTelegramId = telegram.id;
      this.decodedDpt = object.dpt;
      this.decodedOk = decoded.ok;
      this.decodedValue = decoded.ok ? decoded.value : decoded.error.message;
    }
    if (!this.decodedOk) {
      this.emitter.deviceNote(device.id, `object ${object.number}: ${String(this.decodedValue)}`);
      return;
    }
    const value = this.decodedValue;
    this.deliveries++;
    this.store(device, object, value, isWrite ? "write" : "response", destination);
    this.receiver!.transition(
      device,
      isWrite
        ? { kind: "group.write", object: object.number, value, source: telegram.frame.source }
        : { kind: "group.response", object: object.number, value, source: telegram.frame.source },
    );
  }

  private recordGroupValue(destination: number, payload: Uint8Array): void {
    const ga = this.bench().groupAddresses.get(destination);
    if (ga === undefined) return;
    const decoded = getDpt(ga.dpt)!.decode(payload);
    if (decoded.ok) this.groupValues.set(destination, decoded.value);
  }
}
