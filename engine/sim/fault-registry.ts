import { ACK_OCTET, BUSY_OCTET, NAK_OCTET } from "../frame";
import { NO_ACK_OCTET } from "../bus";
import type { FaultSource, TraceEmitter } from "./trace-emitter";

/** Faults the runtime interprets on a device's bus connection. */
export const BUS_FAULTS = { busy: "bus.busy", nak: "bus.nak", silent: "bus.silent" } as const;

/** The one fault a unit link can have. */
export const UNIT_LINK_BROKEN = "link.broken";

/**
 * Every active fault of a run, with who raised it: faults on devices (raised
 * by the device itself or injected by a person) and broken unit links. Each
 * change is traced here, in one place. It also answers what a device's bus
 * connection says while a bus fault is on it.
 */
export class FaultRegistry {
  /** The bench's devices (fixed for a run): they count as devices before any fault. */
  private deviceIds: ReadonlySet<string>;
  /** Faults per device, created at a device's first fault: most devices never have one, and a fork copies only these. */
  private readonly byDevice = new Map<string, Map<string, FaultSource>>();
  private readonly brokenLinks = new Set<string>();

  constructor(
    private readonly emitter: TraceEmitter,
    deviceIds: Iterable<string>,
  ) {
    this.deviceIds = new Set(deviceIds);
  }

  /** Takes over `other`'s active faults, for a forked run. */
  copyFrom(other: FaultRegistry): void {
    // Never changed after construction, so shared.
    this.deviceIds = other.deviceIds;
    this.byDevice.clear();
    for (const [id, faults] of other.byDevice) this.byDevice.set(id, new Map(faults));
    this.brokenLinks.clear();
    for (const link of other.brokenLinks) this.brokenLinks.add(link);
  }

  /** Whether the target is a device of the bench (or one a fault was raised on). */
  isDevice(target: string): boolean {
    return this.deviceIds.has(target) || this.byDevice.has(target);
  }

  /** Active faults of a device, or of a unit link, in the order they were raised. */
  active(target: string): readonly string[] {
    const faults = this.byDevice.get(target);
    if (faults !== undefined) return [...faults.keys()];
    if (this.deviceIds.has(target)) return [];
    return this.brokenLinks.has(target) ? [UNIT_LINK_BROKEN] : [];
  }

  /** Who raised an active fault; undefined when it is not active. */
  raisedBy(target: string, fault: string): FaultSource | undefined {
    const faults = this.byDevice.get(target);
    if (faults !== undefined) return faults.get(fault);
    if (this.deviceIds.has(target)) return undefined;
    return fault === UNIT_LINK_BROKEN && this.brokenLinks.has(target) ? "user" : undefined;
  }

  /** Raises a fault on a device; false (and nothing traced) when it was already active. */
  raise(deviceId: string, fault: string, by: FaultSource, text?: string): boolean {
    const faults = this.deviceFaults(deviceId);
    if (faults.has(fault)) return false;
    faults.set(fault, by);
    this.emitter.fault("fault.raised", { deviceId }, fault, by, text);
    return true;
  }

  /** Clears a fault on a device; false (and nothing traced) when it was not active. */
  clear(deviceId: string, fault: string, by: FaultSource): boolean {
    if (this.byDevice.get(deviceId)?.delete(fault) !== true) return false;
    this.emitter.fault("fault.cleared", { deviceId }, fault, by);
    return true;
  }

  /** Clears every fault the device raised itself (a restart); injected ones stay. */
  clearRaisedByDevice(deviceId: string): void {
    const faults = this.byDevice.get(deviceId);
    if (faults === undefined) return;
    for (const [fault, by] of [...faults]) if (by === "device") this.clear(deviceId, fault, by);
  }

  /** Whether a unit link is broken. */
  isBroken(unitLink: string): boolean {
    return this.brokenLinks.has(unitLink);
  }

  /** Breaks or mends a unit link (a person's doing); false when it already was so. */
  setBroken(unitLink: string, broken: boolean): boolean {
    if (broken === this.brokenLinks.has(unitLink)) return false;
    if (broken) this.brokenLinks.add(unitLink);
    else this.brokenLinks.delete(unitLink);
    this.emitter.fault(
      broken ? "fault.raised" : "fault.cleared",
      { unitLink },
      UNIT_LINK_BROKEN,
      "user",
    );
    return true;
  }

  /** The acknowledgement a device answers with while its bus faults are active: NO_ACK_OCTET when silent. */
  busAnswer(deviceId: string): number {
    const faults = this.byDevice.get(deviceId);
    if (faults === undefined) return ACK_OCTET;
    return faults.has(BUS_FAULTS.silent)
      ? NO_ACK_OCTET
      : faults.has(BUS_FAULTS.busy)
        ? BUSY_OCTET
        : faults.has(BUS_FAULTS.nak)
          ? NAK_OCTET
          : ACK_OCTET;
  }

  private deviceFaults(deviceId: string): Map<string, FaultSource> {
    let faults = this.byDevice.get(deviceId);
    if (faults === undefined) {
      faults = new Map();
      this.byDevice.set(deviceId, faults);
    }
    return faults;
  }
}
