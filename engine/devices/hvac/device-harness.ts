import type { AnyDeviceType, DeviceEffect, DeviceEvent, TransitionResult } from "../device-type";

/**
 * A tiny stand-in for the simulation runtime, for unit tests of device types:
 * it drives pure transitions, stores object values, fires timers in virtual
 * time and routes unit-link messages to the other members after a fixed delay.
 * It sends nothing on KNX: `group.send` effects are recorded in `sent`.
 * (The real runtime is engine/sim; this keeps device tests independent of it.)
 */
export interface HarnessMember {
  readonly id: string;
  readonly type: AnyDeviceType;
  /** Raw parameters, parsed with the type's schema (so `{}` gives the defaults). */
  readonly parameters?: unknown;
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

interface Pending {
  readonly atUs: number;
  readonly seq: number;
  readonly device: string;
  readonly event: DeviceEvent;
  /** Timers carry their set sequence, so a replaced or cancelled timer does not fire. */
  readonly timerToken?: number;
}

/** Unit-link delivery delay of the harness (virtual µs). */
export const HARNESS_LINK_DELAY_US = 2_000;

export class DeviceHarness {
  nowUs = 0;
  readonly sent: SentTelegram[] = [];
  readonly transitions: RecordedTransition[] = [];
  readonly notes: { timeUs: number; device: string; text: string }[] = [];
  readonly faults = new Map<string, Set<string>>();
  private readonly devices = new Map<
    string,
    { type: AnyDeviceType; parameters: unknown; state: unknown; objects: Map<number, unknown> }
  >();
  private readonly queue: Pending[] = [];
  private readonly timers = new Map<string, number>();
  private seq = 0;

  constructor(
    members: readonly HarnessMember[],
    private readonly links: readonly HarnessLink[] = [],
  ) {
    for (const member of members) {
      const parameters = member.type.parameters.parse(member.parameters ?? {});
      this.devices.set(member.id, {
        type: member.type,
        parameters,
        state: member.type.initialState(parameters),
        objects: new Map(),
      });
      this.faults.set(member.id, new Set());
    }
  }

  /** Delivers "start" to every device, in member order. */
  start(): this {
    for (const id of this.devices.keys()) this.dispatch(id, { kind: "start" });
    return this;
  }

  /** Delivers an event now; a group write or response also stores the object value first, as the runtime does. */
  dispatch(device: string, event: DeviceEvent): TransitionResult<unknown> {
    const entry = this.entry(device);
    if (event.kind === "group.write" || event.kind === "group.response")
      entry.objects.set(event.object, event.value);
    const links = this.links.filter((link) => link.members.includes(device)).map((link) => link.id);
    const result = entry.type.transition(entry.state, event, {
      nowUs: this.nowUs,
      deviceId: device,
      individualAddress: 0x1100,
      parameters: entry.parameters,
      links,
      objectValue: (object: number) => entry.objects.get(object),
      random: () => 0.5,
    });
    entry.state = result.state;
    if (result.transition !== undefined)
      this.transitions.push({
        timeUs: this.nowUs,
        device,
        event: event.kind,
        transition: result.transition,
      });
    for (const effect of result.effects) this.apply(device, effect);
    return result;
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
    const entry = this.entry(device);
    entry.parameters = entry.type.parameters.parse({
      ...(entry.parameters as object),
      [key]: value,
    });
  }

  /** Runs queued events (timers, link messages) up to and including `untilUs`, then sets the clock there. */
  runUntil(untilUs: number): this {
    for (;;) {
      this.queue.sort((a, b) => a.atUs - b.atUs || a.seq - b.seq);
      const next = this.queue[0];
      if (next === undefined || next.atUs > untilUs) break;
      this.queue.shift();
      if (
        next.event.kind === "timer" &&
        this.timers.get(`${next.device}:${next.event.name}`) !== next.timerToken
      )
        continue;
      if (next.event.kind === "timer") this.timers.delete(`${next.device}:${next.event.name}`);
      this.nowUs = next.atUs;
      this.dispatch(next.device, next.event);
    }
    this.nowUs = Math.max(this.nowUs, untilUs);
    return this;
  }

  /** Advances the clock by `delayUs`. */
  advance(delayUs: number): this {
    return this.runUntil(this.nowUs + delayUs);
  }

  state<S>(device: string): S {
    return this.entry(device).state as S;
  }

  objectValue(device: string, object: number): unknown {
    return this.entry(device).objects.get(object);
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

  private entry(device: string) {
    const entry = this.devices.get(device);
    if (entry === undefined) throw new Error(`harness has no device "${device}"`);
    return entry;
  }

  private apply(device: string, effect: DeviceEffect): void {
    const entry = this.entry(device);
    switch (effect.kind) {
      case "group.send":
        entry.objects.set(effect.object, effect.value);
        this.sent.push({
          timeUs: this.nowUs,
          device,
          object: effect.object,
          service: effect.service,
          value: effect.value,
        });
        return;
      case "object.store":
        entry.objects.set(effect.object, effect.value);
        return;
      case "group.read":
        return;
      case "timer.set": {
        const token = ++this.seq;
        this.timers.set(`${device}:${effect.name}`, token);
        const event: DeviceEvent =
          effect.data === undefined
            ? { kind: "timer", name: effect.name }
            : { kind: "timer", name: effect.name, data: effect.data };
        this.queue.push({
          atUs: this.nowUs + effect.delayUs,
          seq: token,
          device,
          event,
          timerToken: token,
        });
        return;
      }
      case "timer.cancel":
        this.timers.delete(`${device}:${effect.name}`);
        return;
      case "link.send": {
        const link = this.links.find((candidate) => candidate.id === effect.link);
        if (link === undefined)
          throw new Error(`device "${device}" sent on unknown link "${effect.link}"`);
        for (const member of link.members) {
          // Members the test plays by hand (not harness devices) just do not receive.
          if (member === device || !this.devices.has(member)) continue;
          this.queue.push({
            atUs: this.nowUs + HARNESS_LINK_DELAY_US,
            seq: ++this.seq,
            device: member,
            event: { kind: "link.receive", link: link.id, from: device, message: effect.message },
          });
        }
        return;
      }
      case "fault.raise":
        this.faults.get(device)?.add(effect.fault);
        return;
      case "fault.clear":
        this.faults.get(device)?.delete(effect.fault);
        return;
      case "note":
        this.notes.push({ timeUs: this.nowUs, device, text: effect.text });
        return;
    }
  }
}
