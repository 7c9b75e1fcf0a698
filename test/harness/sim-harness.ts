import { expect } from "vitest";
import { formatGroupAddress, parseGroupAddress } from "@/engine";
import type { BenchInput } from "@/engine";
import { filterTrace, type TraceEvent, type TraceFilter } from "@/engine";
import type { Priority } from "@/engine";
import { parseDuration } from "@/engine";
import { createSimulation, type SimInput, type Simulation, type SimulationOptions } from "@/engine";

/** A duration as integer µs or as readable text ("500ms", "2s"). */
export type Duration = number | string;

function toUs(duration: Duration): number {
  if (typeof duration === "number") return duration;
  const parsed = parseDuration(duration);
  if (!parsed.ok) throw new Error(parsed.error.message);
  return parsed.value;
}

function toRaw(groupAddress: string | number): number {
  if (typeof groupAddress === "number") return groupAddress;
  const parsed = parseGroupAddress(groupAddress);
  if (!parsed.ok) throw new Error(parsed.error.message);
  return parsed.value;
}

function unwrap<T>(
  result: { ok: true; value: T } | { ok: false; error: unknown },
  what: string,
): T {
  if (!result.ok) throw new Error(`${what} was refused: ${JSON.stringify(result.error)}`);
  return result.value;
}

/**
 * A fluent test driver over a `Simulation`: act, let virtual time pass, assert.
 *
 *   harness.write("1/0/1", true).runFor("1s").expectGroupValue("1/0/2", true)
 *
 * Every step returns the harness; assertions fail with the trace slice that
 * matters in the message. `sim` is there for anything the driver lacks.
 */
export class SimHarness {
  readonly sim: Simulation;

  constructor(bench: BenchInput, options: Partial<SimulationOptions> = {}) {
    this.sim = createSimulation(bench, { seed: 1, ...options });
  }

  static create(bench: BenchInput, options: Partial<SimulationOptions> = {}): SimHarness {
    return new SimHarness(bench, options);
  }

  get nowUs(): number {
    return this.sim.nowUs;
  }

  get trace(): readonly TraceEvent[] {
    return this.sim.trace;
  }

  // -------------------------------------------------------------- acting

  /** Applies any simulation input (the one input language); a refused input fails the test with its error. */
  do(input: SimInput): this {
    unwrap(this.sim.apply(input), `${input.kind}`);
    return this;
  }

  write(
    groupAddress: string | number,
    value: unknown,
    options: { from?: string; priority?: Priority } = {},
  ): this {
    unwrap(this.sim.sendGroupWrite(groupAddress, value, options), `write ${groupAddress}`);
    return this;
  }

  read(groupAddress: string | number, options: { from?: string; priority?: Priority } = {}): this {
    unwrap(this.sim.sendGroupRead(groupAddress, options), `read ${groupAddress}`);
    return this;
  }

  press(
    deviceId: string,
    buttonId: string,
    action: "press" | "release" | "long-press" = "press",
  ): this {
    unwrap(this.sim.pressButton(deviceId, buttonId, action), `press ${deviceId}/${buttonId}`);
    return this;
  }

  input(deviceId: string, input: string, value: unknown): this {
    unwrap(this.sim.setInput(deviceId, input, value), `input ${deviceId}/${input}`);
    return this;
  }

  setParameter(deviceId: string, key: string, value: unknown): this {
    unwrap(this.sim.setParameter(deviceId, key, value), `parameter ${deviceId}.${key}`);
    return this;
  }

  injectFault(target: string, fault: string): this {
    unwrap(this.sim.injectFault(target, fault), `fault ${fault} on ${target}`);
    return this;
  }

  clearFault(target: string, fault: string): this {
    unwrap(this.sim.clearFault(target, fault), `clear ${fault} on ${target}`);
    return this;
  }

  // -------------------------------------------------------------- time

  runFor(duration: Duration): this {
    this.sim.runFor(toUs(duration));
    return this;
  }

  runUntil(time: Duration): this {
    this.sim.runUntil(toUs(time));
    return this;
  }

  /** Runs until nothing is scheduled (at most `max`, 60 s by default). */
  settle(max: Duration = "60s"): this {
    this.sim.runUntilIdle(toUs(max));
    return this;
  }

  // -------------------------------------------------------------- asserting

  /** Trace events matching a filter (addresses as text or raw). */
  events(
    filter: Omit<TraceFilter, "address"> & { address?: string | number } = {},
  ): readonly TraceEvent[] {
    const { address, ...rest } = filter;
    return filterTrace(
      this.sim.trace,
      address === undefined ? rest : { ...rest, address: toRaw(address) },
    );
  }

  expectGroupValue(
    groupAddress: string | number,
    expected: unknown,
    options: { tolerance?: number } = {},
  ): this {
    const actual = this.sim.groupValue(groupAddress);
    const where = `group value of ${typeof groupAddress === "number" ? formatGroupAddress(groupAddress) : groupAddress} at ${this.nowUs} µs\n${this.describe({ address: groupAddress })}`;
    if (options.tolerance !== undefined && typeof expected === "number") {
      expect(typeof actual, where).toBe("number");
      expect(Math.abs((actual as number) - expected), where).toBeLessThanOrEqual(options.tolerance);
    } else expect(actual, where).toEqual(expected);
    return this;
  }

  expectObjectValue(deviceId: string, object: number, expected: unknown): this {
    expect(
      this.sim.objectValue(deviceId, object),
      `object ${object} of "${deviceId}" at ${this.nowUs} µs\n${this.describe({ deviceId })}`,
    ).toEqual(expected);
    return this;
  }

  /** The device state matches (a subset of) `expected`. */
  expectState(deviceId: string, expected: Record<string, unknown>): this {
    expect(
      this.sim.deviceState(deviceId),
      `state of "${deviceId}" at ${this.nowUs} µs\n${this.describe({ deviceId })}`,
    ).toMatchObject(expected);
    return this;
  }

  /** Number of trace events of a kind (default "telegram.sent") matching the filter. */
  expectCount(
    expected: number,
    filter: Omit<TraceFilter, "address"> & { address?: string | number } = {},
  ): this {
    const kinds = filter.kinds ?? ["telegram.sent"];
    const found = this.events({ ...filter, kinds });
    expect(
      found.length,
      `${kinds.join(", ")} events matching ${JSON.stringify(filter)}\n${format(found)}`,
    ).toBe(expected);
    return this;
  }

  expectFault(target: string, fault: string, active = true): this {
    const faults = this.sim.activeFaults(target);
    expect(
      faults.includes(fault),
      `fault "${fault}" on "${target}" (active: ${faults.join(", ") || "none"})`,
    ).toBe(active);
    return this;
  }

  /** The trace (or a filtered part) as readable lines, for failure messages and debugging. */
  describe(filter: Omit<TraceFilter, "address"> & { address?: string | number } = {}): string {
    return format(this.events(filter).slice(-30));
  }
}

function format(events: readonly TraceEvent[]): string {
  return events
    .map((e) => {
      const { kind, timeUs, ...rest } = e;
      return `  ${String(timeUs).padStart(10)} µs  ${kind}  ${JSON.stringify(rest)}`;
    })
    .join("\n");
}
