import {
  DeviceBench,
  type DeviceBenchRoom,
  UNIT_LINK_DELAY_US,
  type AnyDeviceType,
  type DeviceEvent,
  type TransitionResult,
} from "../../engine";

/**
 * The driver for unit tests of device types: devices run on the engine's real
 * runtime (DeviceBench: transitions, effects, timers, the unit-link medium with
 * its real 10 ms delay, the fault registry), with no KNX line. `group.send`
 * effects are recorded in `sent`; transitions, notes and faults are read from
 * the trace as it is written.
 */
export interface HarnessMember {
  readonly id: string;
  readonly type: AnyDeviceType;
  /** Raw parameters, parsed with the type's schema (so `{}` gives the defaults). */
  readonly parameters?: unknown;
  /** A room of the harness's `rooms` the device sits in; absent: its own room, if it needs one. */
  readonly room?: string;
}

export interface HarnessLink {
  readonly id: string;
  readonly members: readonly string[];
}

export interface SentTelegram {
  readonly timeUs: number;
  readonly device: string;
  readonly object: number;
  readonly service: "write" | "response";
  readonly value: unknown;
}

export interface RecordedTransition {
  readonly timeUs: number;
  readonly device: string;
  readonly event: DeviceEvent["kind"];
  readonly transition: string;
}

/** Unit-link delivery delay of the harness (virtual µs): the runtime's own. */
export const HARNESS_LINK_DELAY_US = UNIT_LINK_DELAY_US;

export class DeviceHarness {
  readonly sent: SentTelegram[] = [];
  readonly transitions: RecordedTransition[] = [];
  readonly notes: { timeUs: number; device: string; text: string }[] = [];
  readonly faults = new Map<string, Set<string>>();
  private readonly bench: DeviceBench;

  constructor(
    members: readonly HarnessMember[],
    links: readonly HarnessLink[] = [],
    rooms: readonly DeviceBenchRoom[] = [],
  ) {
    for (const member of members) this.faults.set(member.id, new Set());
    this.bench = new DeviceBench(
      members,
      links,
      (device, effect) => {
        if (effect.kind === "group.send")
          this.sent.push({
            timeUs: this.bench.nowUs,
            device,
            object: effect.object,
            service: effect.service,
            value: effect.value,
          });
      },
      rooms,
    );
    this.bench.trace.subscribe((event) => {
      switch (event.kind) {
        case "device.transition":
          this.transitions.push({
            timeUs: event.timeUs,
            device: event.deviceId,
            event: event.cause as DeviceEvent["kind"],
            transition: event.transition,
          });
          return;
        case "device.note":
          this.notes.push({ timeUs: event.timeUs, device: event.deviceId, text: event.text });
          return;
        case "fault.raised":
          if (event.deviceId !== undefined) this.faults.get(event.deviceId)?.add(event.fault);
          return;
        case "fault.cleared":
          if (event.deviceId !== undefined) this.faults.get(event.deviceId)?.delete(event.fault);
          return;
        default:
          return;
      }
    });
  }

  /** Virtual time now, µs. */
  get nowUs(): number {
    return this.bench.nowUs;
  }

  /** Delivers "start" to every device, in member order. */
  start(): this {
    this.bench.start();
    return this;
  }

  /** Delivers an event now; a group write or response also stores the object value first, as the runtime does. */
  dispatch(device: string, event: DeviceEvent): TransitionResult<unknown> {
    return this.bench.dispatch(device, event);
  }

  /** A GroupValue_Write from the bus reaching `object` of `device`. */
  write(device: string, object: number, value: unknown): TransitionResult<unknown> {
    return this.dispatch(device, { kind: "group.write", object, value, source: 0x11fa });
  }

  press(device: string, button: string): TransitionResult<unknown> {
    return this.dispatch(device, { kind: "button", button, action: "press" });
  }

  /** Changes a parameter in place (as a person editing the bench does); the device sees it on its next transition. */
  setParameter(device: string, key: string, value: unknown): void {
    this.bench.setParameters(device, {
      ...(this.bench.parameters(device) as object),
      [key]: value,
    });
  }

  /** Runs queued events (timers, link messages) up to and including `untilUs`, then sets the clock there. */
  runUntil(untilUs: number): this {
    this.bench.runUntil(untilUs);
    return this;
  }

  /** Advances the clock by `delayUs`. */
  advance(delayUs: number): this {
    return this.runUntil(this.nowUs + delayUs);
  }

  state<S>(device: string): S {
    return this.bench.state(device) as S;
  }

  /** Air temperature now of a harness room, or of a device's own room ("device:<id>"), °C. */
  roomC(roomId: string): number {
    return this.bench.climate.temperatureC(roomId);
  }

  objectValue(device: string, object: number): unknown {
    return this.bench.objectValue(device, object);
  }

  /** Telegrams a device sent from one object, oldest first. */
  sentFrom(device: string, object: number): SentTelegram[] {
    return this.sent.filter((telegram) => telegram.device === device && telegram.object === object);
  }

  transitionNames(device?: string): string[] {
    return this.transitions
      .filter((t) => device === undefined || t.device === device)
      .map((t) => t.transition);
  }
}
