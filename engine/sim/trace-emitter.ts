import type { Trace, TraceEvent } from "../core/trace";
import type { SimInput } from "./sim-input";

/** Who raised a fault: the device itself, or a person (console, scenario, test). */
export type FaultSource = "device" | "user";

/** A fault's place: a device or a unit link. */
export type FaultTarget = { readonly deviceId: string } | { readonly unitLink: string };

type UserActionFields = Omit<
  Extract<TraceEvent, { kind: "user.action" }>,
  "kind" | "timeUs" | "input"
>;

/**
 * The runtime's one way to write the trace. Every event the simulation (not
 * the bus line) records is built here, and only while the trace is recording
 * or watched, so a run with the trace off builds no event objects.
 */
export class TraceEmitter {
  constructor(
    readonly trace: Trace,
    private readonly clock: { readonly nowUs: number },
  ) {}

  /** Whether events are being kept or watched. */
  get active(): boolean {
    return this.trace.active;
  }

  deviceTransition(deviceId: string, transition: string, cause: string): void {
    if (this.trace.active)
      this.trace.append({
        kind: "device.transition",
        timeUs: this.clock.nowUs,
        deviceId,
        transition,
        cause,
      });
  }

  deviceNote(deviceId: string, text: string): void {
    if (this.trace.active)
      this.trace.append({ kind: "device.note", timeUs: this.clock.nowUs, deviceId, text });
  }

  timerFired(deviceId: string, name: string): void {
    if (this.trace.active)
      this.trace.append({ kind: "timer.fired", timeUs: this.clock.nowUs, deviceId, name });
  }

  objectChanged(
    deviceId: string,
    object: number,
    value: unknown,
    previous: unknown,
    cause: "write" | "response" | "send" | "store",
    groupAddress: number | undefined,
  ): void {
    if (!this.trace.active) return;
    const timeUs = this.clock.nowUs;
    this.trace.append(
      groupAddress === undefined
        ? { kind: "object.changed", timeUs, deviceId, object, value, previous, cause }
        : {
            kind: "object.changed",
            timeUs,
            deviceId,
            object,
            value,
            previous,
            cause,
            groupAddress,
          },
    );
  }

  fault(
    kind: "fault.raised" | "fault.cleared",
    target: FaultTarget,
    fault: string,
    by: FaultSource,
    text?: string,
  ): void {
    if (!this.trace.active) return;
    const timeUs = this.clock.nowUs;
    this.trace.append(
      kind === "fault.raised"
        ? { kind, timeUs, fault, by, ...target, ...(text === undefined ? {} : { text }) }
        : { kind, timeUs, fault, by, ...target },
    );
  }

  link(
    kind: "link.delivered" | "link.dropped",
    unitLink: string,
    from: string,
    deviceId: string,
    message: unknown,
  ): void {
    if (this.trace.active)
      this.trace.append({ kind, timeUs: this.clock.nowUs, unitLink, from, deviceId, message });
  }

  userAction(fields: UserActionFields, input: SimInput): void {
    if (this.trace.active)
      this.trace.append({ kind: "user.action", timeUs: this.clock.nowUs, ...fields, input });
  }
}
