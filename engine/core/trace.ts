import type { GroupService, Priority } from "../frame";
import type { SimInput } from "../sim/sim-input";
import { runArray } from "./run-objects";

/**
 * The trace: one ordered stream of everything that happened in a run, with
 * virtual timestamps. The UI's telegram log, the scenario runner's verdicts and
 * reports all read it, so events are plain JSON (numbers, strings, booleans and
 * DPT values), never class instances or byte arrays.
 *
 * Appending is a push onto an array (or a write into a ring when a capacity is
 * set); the runtime checks `trace.active` before building an event, so a run
 * with recording off and no subscribers builds no event objects at all.
 */

/** Why the sender had to repeat a frame or gave up on it. */
export type AckOutcome = "ack" | "nak" | "busy" | "none";

/** Fields shared by every telegram event. Addresses are raw numbers; format them for display. */
export interface TelegramTraceFields {
  readonly timeUs: number;
  /** Id of the telegram within the run; the same across its repetitions. */
  readonly telegramId: number;
  /** Line id from the bench. */
  readonly line: string;
  /** Raw individual address of the sender. */
  readonly source: number;
  /** Raw destination (group address for group telegrams). */
  readonly destination: number;
  readonly service: GroupService;
  readonly priority: Priority;
  /** Payload octets as upper-case hex without spaces ("" for a read). */
  readonly payloadHex: string;
  /** Whether the data travels in the APCI octet (<= 6 bits). */
  readonly shortPayload: boolean;
  /** Device id of the sender; absent when the test tool sent it. */
  readonly deviceId?: string;
  /** Set on an individually addressed telegram: `destination` is then an individual address. */
  readonly individual?: true;
}

/**
 * Fields shared by every coupler event: a telegram heard on `fromLine` that the
 * coupler passes (or does not pass) towards `toLine`.
 */
export interface CouplerTraceFields {
  readonly timeUs: number;
  /** Device id of the coupler. */
  readonly coupler: string;
  /** The telegram as heard on `fromLine`. */
  readonly telegramId: number;
  /** The same telegram as the coupler sends it on `toLine`. */
  readonly forwardedTelegramId: number;
  readonly fromLine: string;
  readonly toLine: string;
  /** Raw destination address. */
  readonly destination: number;
  /** Set when the telegram is individually addressed (`destination` is an individual address). */
  readonly individual?: true;
}

export type TraceEvent =
  /** A telegram entered its sender's queue. */
  | ({ readonly kind: "telegram.queued" } & TelegramTraceFields)
  /** A frame went on the line; `timeUs` is its first bit, `endUs` its last. */
  | ({
      readonly kind: "telegram.sent";
      readonly endUs: number;
      /** 0 for the first transmission, 1..3 for repetitions. */
      readonly attempt: number;
      readonly repeated: boolean;
      readonly octets: number;
      /** Other senders that started in the same slot and lost arbitration. */
      readonly arbitrationLosers: number;
    } & TelegramTraceFields)
  /** The sender heard a positive acknowledgement. */
  | ({ readonly kind: "telegram.acked"; readonly attempt: number } & TelegramTraceFields)
  /** The sender will transmit again with the repeat flag set. */
  | ({
      readonly kind: "telegram.repeated";
      readonly attempt: number;
      readonly reason: Exclude<AckOutcome, "ack">;
    } & TelegramTraceFields)
  /** The sender gave up after the last repetition. */
  | ({
      readonly kind: "telegram.lost";
      readonly attempt: number;
      readonly reason: Exclude<AckOutcome, "ack">;
    } & TelegramTraceFields)
  /** A device's transition named what it did and why. */
  | {
      readonly kind: "device.transition";
      readonly timeUs: number;
      readonly deviceId: string;
      readonly transition: string;
      /** Kind of the device event that caused it ("group.write", "timer", ...). */
      readonly cause: string;
    }
  /** A line of explanation a device added. */
  | {
      readonly kind: "device.note";
      readonly timeUs: number;
      readonly deviceId: string;
      readonly text: string;
    }
  /** A group object's stored value changed. */
  | {
      readonly kind: "object.changed";
      readonly timeUs: number;
      readonly deviceId: string;
      readonly object: number;
      readonly value: unknown;
      readonly previous: unknown;
      /** "write" / "response" from the bus, "send" / "store" from the device itself, "restart" when cleared. */
      readonly cause: "write" | "response" | "send" | "store" | "restart";
      /** Group address involved (raw), when the change came from or goes to the bus. */
      readonly groupAddress?: number;
    }
  /** A device timer expired and was handed to the device. */
  | {
      readonly kind: "timer.fired";
      readonly timeUs: number;
      readonly deviceId: string;
      readonly name: string;
    }
  /** A fault appeared on a device or a unit link, raised by the device itself or injected by a person. */
  | {
      readonly kind: "fault.raised";
      readonly timeUs: number;
      readonly fault: string;
      readonly by: "device" | "user";
      readonly deviceId?: string;
      readonly unitLink?: string;
      readonly text?: string;
    }
  | {
      readonly kind: "fault.cleared";
      readonly timeUs: number;
      readonly fault: string;
      readonly by: "device" | "user";
      readonly deviceId?: string;
      readonly unitLink?: string;
    }
  /** A message between unit-link members was delivered to one member, or dropped because the link is broken. */
  | {
      readonly kind: "link.delivered" | "link.dropped";
      readonly timeUs: number;
      readonly unitLink: string;
      readonly from: string;
      readonly deviceId: string;
      readonly message: unknown;
    }
  /**
   * A coupler took a telegram heard on `fromLine` (and acknowledged it) and
   * queued it for `toLine` as `forwardedTelegramId`, with `hopCount` the
   * decreased routing counter it carries there.
   */
  | ({ readonly kind: "coupler.forward"; readonly hopCount: number } & CouplerTraceFields)
  /** A forwarded telegram waits in the coupler's buffer: `toLine` is busy or `queued` telegrams are ahead of it. */
  | ({
      readonly kind: "coupler.hold";
      /** Telegrams ahead of it in the buffer for `toLine`. */
      readonly queued: number;
    } & CouplerTraceFields)
  /**
   * A coupler did not pass a telegram on: not in its filter table ("filter"),
   * group or individual telegrams blocked by its setting ("blocked"), routing
   * counter used up ("hop-count"), its buffer full ("queue-full": it answered
   * BUSY, so the sender repeats), or nobody acknowledged it on `toLine` after
   * the last repetition ("not-acknowledged"). `forwardedTelegramId` is set
   * only for "not-acknowledged": the telegram as it was sent on `toLine`.
   */
  | ({
      readonly kind: "coupler.drop";
      readonly reason: "filter" | "blocked" | "hop-count" | "queue-full" | "not-acknowledged";
    } & Omit<CouplerTraceFields, "forwardedTelegramId"> &
      Partial<Pick<CouplerTraceFields, "forwardedTelegramId">>)
  /** Something a person (or a scenario step) did from outside. */
  | {
      readonly kind: "user.action";
      readonly timeUs: number;
      readonly action:
        | "group.write"
        | "group.read"
        | "button"
        | "input"
        | "parameter"
        | "fault.inject"
        | "fault.clear";
      readonly deviceId?: string;
      readonly unitLink?: string;
      readonly groupAddress?: number;
      readonly detail: string;
      /** The input exactly as applied (group address as text), so a recorder can replay it. */
      readonly input: SimInput;
    };

export type TraceEventKind = TraceEvent["kind"];

/** What `filterTrace` keeps; every given criterion must match. */
export interface TraceFilter {
  /** Raw group (or individual) address: telegrams to or from it, object changes on it, user actions on it. */
  readonly address?: number;
  /** Events about this device: its telegrams, transitions, objects, timers, faults, link messages. */
  readonly deviceId?: string;
  /** Exact kinds ("telegram.sent") or prefixes ending in a dot ("telegram."). */
  readonly kinds?: readonly string[];
  /** Inclusive start, microseconds. */
  readonly fromUs?: number;
  /** Exclusive end, microseconds. */
  readonly toUs?: number;
}

export type TraceListener = (event: TraceEvent) => void;

/** How much of the trace a run keeps. */
export interface TraceOptions {
  /**
   * Maximum number of events kept. `undefined` keeps everything (scenario runs,
   * golden files); a positive number keeps the most recent events in a ring
   * (the live console, long runs); 0 keeps nothing, so with no subscriber the
   * runtime skips building events entirely (the bus benchmark).
   */
  readonly capacity?: number;
}

export class Trace {
  private readonly capacity: number;
  private buffer: TraceEvent[] = runArray<TraceEvent>();
  /** Index of the oldest event in the ring once it has wrapped. */
  private head = 0;
  private listeners: TraceListener[] = [];
  private total = 0;
  /** True when appended events go somewhere: kept, or seen by a subscriber. */
  active: boolean;

  constructor(options: TraceOptions = {}) {
    const capacity = options.capacity ?? Infinity;
    if (!(capacity >= 0) || (capacity !== Infinity && !Number.isInteger(capacity))) {
      throw new Error(`Trace: capacity ${capacity} is not a non-negative integer`);
    }
    this.capacity = capacity;
    this.active = capacity > 0;
  }

  /** Number of events ever appended, including ones a ring has dropped. */
  get appended(): number {
    return this.total;
  }

  append(event: TraceEvent): void {
    this.total++;
    if (this.capacity === Infinity) {
      this.buffer.push(event);
    } else if (this.capacity > 0) {
      if (this.buffer.length < this.capacity) this.buffer.push(event);
      else {
        this.buffer[this.head] = event;
        this.head = this.head + 1 === this.capacity ? 0 : this.head + 1;
      }
    }
    const listeners = this.listeners;
    for (let i = 0; i < listeners.length; i++) listeners[i]!(event);
  }

  /** Takes over `other`'s kept events (shared: events are never changed), for a forked run. */
  copyFrom(other: Trace): void {
    this.buffer = other.buffer.slice();
    this.head = other.head;
    this.total = other.total;
  }

  /** Calls `listener` with every event appended from now on; returns the unsubscribe function. */
  subscribe(listener: TraceListener): () => void {
    this.listeners = [...this.listeners, listener];
    this.active = true;
    return () => {
      this.listeners = this.listeners.filter((l) => l !== listener);
      this.active = this.capacity > 0 || this.listeners.length > 0;
    };
  }

  /** The kept events, oldest first. A fresh array when the ring has wrapped, else the live one (do not mutate). */
  events(): readonly TraceEvent[] {
    if (this.head === 0) return this.buffer;
    return [...this.buffer.slice(this.head), ...this.buffer.slice(0, this.head)];
  }

  /** Kept events with fromUs <= timeUs < toUs, found by binary search (events are in time order). */
  slice(fromUs: number, toUs: number): readonly TraceEvent[] {
    return sliceByTime(this.events(), fromUs, toUs);
  }

  filter(criteria: TraceFilter): readonly TraceEvent[] {
    return filterTrace(this.events(), criteria);
  }
}

/** Events with fromUs <= timeUs < toUs from a time-ordered list. */
export function sliceByTime(
  events: readonly TraceEvent[],
  fromUs: number,
  toUs: number,
): readonly TraceEvent[] {
  return events.slice(lowerBound(events, fromUs), lowerBound(events, toUs));
}

function lowerBound(events: readonly TraceEvent[], timeUs: number): number {
  let lo = 0;
  let hi = events.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (events[mid]!.timeUs < timeUs) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Keeps the events that match every given criterion, in order. */
export function filterTrace(
  events: readonly TraceEvent[],
  criteria: TraceFilter,
): readonly TraceEvent[] {
  const from = criteria.fromUs ?? -Infinity;
  const to = criteria.toUs ?? Infinity;
  const ranged = from === -Infinity && to === Infinity ? events : sliceByTime(events, from, to);
  const kinds = criteria.kinds;
  return ranged.filter(
    (e) =>
      (kinds === undefined ||
        kinds.some((k) => (k.endsWith(".") ? e.kind.startsWith(k) : e.kind === k))) &&
      (criteria.address === undefined || eventTouchesAddress(e, criteria.address)) &&
      (criteria.deviceId === undefined || eventTouchesDevice(e, criteria.deviceId)),
  );
}

function eventTouchesAddress(event: TraceEvent, address: number): boolean {
  switch (event.kind) {
    case "telegram.queued":
    case "telegram.sent":
    case "telegram.acked":
    case "telegram.repeated":
    case "telegram.lost":
      return event.destination === address || event.source === address;
    case "object.changed":
    case "user.action":
      return event.groupAddress === address;
    case "coupler.forward":
    case "coupler.hold":
    case "coupler.drop":
      return event.destination === address;
    default:
      return false;
  }
}

/** Whether an event is about a device: its telegrams, transitions, objects, timers, faults, link messages. */
export function eventTouchesDevice(event: TraceEvent, deviceId: string): boolean {
  switch (event.kind) {
    case "link.delivered":
    case "link.dropped":
      return event.deviceId === deviceId || event.from === deviceId;
    case "coupler.forward":
    case "coupler.hold":
    case "coupler.drop":
      return event.coupler === deviceId;
    default:
      return "deviceId" in event && event.deviceId === deviceId;
  }
}

const HEX = "0123456789ABCDEF";

/** Upper-case hex without separators, as the trace stores payloads. */
export function toHex(bytes: Uint8Array): string {
  let text = "";
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i]!;
    text += HEX[b >> 4]! + HEX[b & 15]!;
  }
  return text;
}
