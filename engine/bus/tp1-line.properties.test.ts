import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { benchBuilder, registerTestDevices, type RecorderState } from "@/test/harness";
import type { TraceEvent } from "../core/trace";
import { bitTimesToUs, telegramOccupancyUs, type Priority } from "../frame";
import { BUS_FAULTS, createSimulation, type Simulation } from "../sim";

beforeAll(registerTestDevices);

// TP1 timing, knx-reference.md ("TP1 timing"; Basic course, TP1 conformance §10.1.2).
const IDLE_US = bitTimesToUs(50);
const PRIORITY_RANK: Record<Priority, number> = { system: 0, urgent: 1, normal: 2, low: 3 };
const PRIORITIES: readonly Priority[] = ["system", "normal", "urgent", "low"];

type Sent = Extract<TraceEvent, { kind: "telegram.sent" }>;
const sentFrames = (trace: readonly TraceEvent[]) =>
  trace.filter((e): e is Sent => e.kind === "telegram.sent");

/** Four recorders on 1/1/1 (7.001), one switch actuator with status and a push-button. */
function busyBench() {
  const b = benchBuilder()
    .groupAddress("1/1/1", "7.001")
    .groupAddress("1/0/1", "1.001")
    .groupAddress("1/0/2", "1.001");
  for (let i = 1; i <= 4; i++)
    b.device(`r${i}`, "test-recorder", `1.1.${10 + i}`).link(`r${i}`, 0, "1/1/1");
  return b
    .device("pb", "push-button", "1.1.1")
    .device("act", "switch-actuator", "1.1.2")
    .link("pb", 0, "1/0/1", "1/0/2")
    .link("act", 0, "1/0/1")
    .link("act", 1, "1/0/2")
    .build();
}

const TOOL_VALUES_FROM = 10_000;

type Input =
  | { readonly kind: "wait"; readonly us: number }
  | { readonly kind: "write"; readonly value: number; readonly priority: Priority }
  | { readonly kind: "read" }
  | { readonly kind: "press" }
  | { readonly kind: "random-send"; readonly recorder: number }
  | {
      readonly kind: "fault";
      readonly recorder: number;
      readonly fault: "bus.busy" | "bus.nak";
      readonly on: boolean;
    };

const inputArb: fc.Arbitrary<Input> = fc.oneof(
  fc.record({ kind: fc.constant("wait" as const), us: fc.integer({ min: 0, max: 200_000 }) }),
  fc.record({
    kind: fc.constant("write" as const),
    value: fc.integer({ min: 0, max: 65535 }),
    priority: fc.constantFrom(...PRIORITIES),
  }),
  fc.record({ kind: fc.constant("read" as const) }),
  fc.record({ kind: fc.constant("press" as const) }),
  fc.record({
    kind: fc.constant("random-send" as const),
    recorder: fc.integer({ min: 1, max: 4 }),
  }),
  fc.record({
    kind: fc.constant("fault" as const),
    recorder: fc.integer({ min: 1, max: 4 }),
    fault: fc.constantFrom(BUS_FAULTS.busy, BUS_FAULTS.nak),
    on: fc.boolean(),
  }),
);

/** Plays inputs against a fresh simulation; returns it and the value each test-tool write carried, by telegram id. */
function play(
  inputs: readonly Input[],
  seed: number,
): { sim: Simulation; written: Map<number, number> } {
  const sim = createSimulation(busyBench(), { seed });
  const written = new Map<number, number>();
  let unique = 0;
  for (const input of inputs) {
    switch (input.kind) {
      case "wait":
        sim.runFor(input.us);
        break;
      case "write": {
        // Distinct values above the recorders' own random sends (0..999), so each list shows which telegram it took.
        const value = TOOL_VALUES_FROM + unique++;
        const id = sim.sendGroupWrite("1/1/1", value, { priority: input.priority });
        if (id.ok) written.set(id.value, value);
        break;
      }
      case "read":
        sim.sendGroupRead("1/0/2");
        break;
      case "press":
        sim.pressButton("pb", "channel-1");
        break;
      case "random-send":
        sim.setInput(`r${input.recorder}`, "send-random", null);
        break;
      case "fault":
        if (input.on) sim.injectFault(`r${input.recorder}`, input.fault);
        else sim.clearFault(`r${input.recorder}`, input.fault);
        break;
    }
  }
  sim.runUntilIdle(10_000_000);
  return { sim, written };
}

describe("TP1 line properties", () => {
  it("gives an identical trace for the same bench, seed and inputs", () => {
    fc.assert(
      fc.property(fc.array(inputArb, { maxLength: 40 }), fc.integer(), (inputs, seed) => {
        const a = play(inputs, seed).sim.trace;
        const b = play(inputs, seed).sim.trace;
        expect(JSON.stringify(b)).toBe(JSON.stringify(a));
      }),
      { numRuns: 60 },
    );
  });

  it("never overlaps frames: each starts at least 50 idle bit times after the previous one ended", () => {
    fc.assert(
      fc.property(fc.array(inputArb, { maxLength: 60 }), (inputs) => {
        const frames = sentFrames(play(inputs, 1).sim.trace);
        for (let i = 1; i < frames.length; i++)
          expect(frames[i]!.timeUs - frames[i - 1]!.endUs).toBeGreaterThanOrEqual(IDLE_US);
      }),
      { numRuns: 80 },
    );
  });

  it("delivers each write to every write-flag listener exactly once despite repetitions", () => {
    fc.assert(
      fc.property(fc.array(inputArb, { maxLength: 60 }), (inputs) => {
        const { sim, written } = play(inputs, 1);
        const lists = [1, 2, 3, 4].map(
          (i) =>
            (sim.deviceState(`r${i}`) as RecorderState).writes.filter(
              (v) => typeof v === "number" && v >= TOOL_VALUES_FROM,
            ) as number[],
        );
        // At most once: nobody takes a repetition of a frame it already took.
        for (const list of lists) expect(new Set(list).size).toBe(list.length);
        // Exactly once when the sender finally heard ACK from everyone.
        for (const event of sim.trace) {
          if (event.kind !== "telegram.acked" || !written.has(event.telegramId)) continue;
          const value = written.get(event.telegramId)!;
          for (const list of lists) expect(list).toContain(value);
        }
      }),
      { numRuns: 80 },
    );
  });

  it("never counts more busy time than has elapsed, in any window", () => {
    fc.assert(
      fc.property(
        fc.array(inputArb, { maxLength: 60 }),
        fc.array(fc.integer({ min: 1, max: 5_000_000 }), { minLength: 1, maxLength: 5 }),
        (inputs, windows) => {
          const { sim } = play(inputs, 1);
          const line = sim.line();
          expect(line.occupiedUsTotal).toBeLessThanOrEqual(sim.nowUs);
          expect(line.busyUsTotal).toBeLessThanOrEqual(line.occupiedUsTotal);
          for (const windowUs of windows) {
            const stats = sim.busStats(windowUs);
            expect(stats.occupiedUs).toBeLessThanOrEqual(Math.min(windowUs, sim.nowUs));
            expect(stats.busyUs).toBeLessThanOrEqual(stats.occupiedUs);
            expect(stats.loadPercent).toBeLessThanOrEqual(100);
          }
        },
      ),
      { numRuns: 80 },
    );
  });

  it("always gives the line to the higher priority among senders that start together", () => {
    fc.assert(
      fc.property(
        fc.array(fc.constantFrom(...PRIORITIES), { minLength: 2, maxLength: 12 }),
        (priorities) => {
          const b = benchBuilder()
            .groupAddress("1/1/1", "7.001")
            .device("sink", "test-recorder", "1.1.200")
            .link("sink", 0, "1/1/1");
          priorities.forEach((_, i) => b.device(`s${i}`, "test-recorder", `1.1.${i + 1}`));
          const sim = createSimulation(b.build(), { seed: 1 });
          priorities.forEach((priority, i) =>
            sim.sendGroupWrite("1/1/1", i, { from: `s${i}`, priority }),
          );
          sim.runUntilIdle();
          const ranks = sentFrames(sim.trace).map((f) => PRIORITY_RANK[f.priority]);
          // knx-reference.md: lower priority code wins arbitration (system > urgent > normal > low).
          expect(ranks).toEqual([...ranks].sort((x, y) => x - y));
          expect(ranks).toHaveLength(priorities.length);
        },
      ),
      { numRuns: 100 },
    );
  });

  it("settles a saturated line at one short telegram per 193 bit times: 9600/193 ≈ 49.74 per second", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 6 }),
        fc.integer({ min: 5, max: 40 }),
        (senders, perSender) => {
          const b = benchBuilder()
            .groupAddress("1/0/1", "1.001")
            .device("sink", "switch-actuator", "1.1.200", { statusObjects: false })
            .link("sink", 0, "1/0/1");
          for (let i = 0; i < senders; i++) b.device(`s${i}`, "test-recorder", `1.1.${i + 1}`);
          const sim = createSimulation(b.build(), { seed: 1 });
          for (let k = 0; k < perSender; k++)
            for (let i = 0; i < senders; i++)
              sim.sendGroupWrite("1/0/1", k % 2 === 0, { from: `s${i}` });
          sim.runUntilIdle();
          const starts = sentFrames(sim.trace).map((f) => f.timeUs);
          expect(starts).toHaveLength(senders * perSender);
          // Basic course: 50 + 9 × 13 + 15 + 11 = 193 bit times per acknowledged 9-octet telegram.
          for (let i = 1; i < starts.length; i++)
            expect(starts[i]! - starts[i - 1]!).toBe(telegramOccupancyUs(9));
        },
      ),
      { numRuns: 30 },
    );
  });

  it("states the saturated rate and load: 49.74 telegrams/s and 100 % in the course's accounting", () => {
    const b = benchBuilder()
      .groupAddress("1/0/1", "1.001")
      .device("sink", "switch-actuator", "1.1.200", { statusObjects: false })
      .link("sink", 0, "1/0/1");
    for (let i = 0; i < 4; i++) b.device(`s${i}`, "test-recorder", `1.1.${i + 1}`);
    const sim = createSimulation(b.build(), { seed: 1, traceCapacity: 0 });
    for (let k = 0; k < 1000; k++)
      for (let i = 0; i < 4; i++) sim.sendGroupWrite("1/0/1", k % 2 === 0, { from: `s${i}` });
    sim.runUntil(60_000_000);
    const stats = sim.busStats(50_000_000);
    // Derived from the Basic course timing: 9600 / 193 = 49.7409... telegrams per second.
    expect(stats.telegrams / 50).toBeCloseTo(9600 / 193, 1);
    expect(Math.abs(stats.telegrams / 50 - 9600 / 193)).toBeLessThan(0.05);
    expect(stats.loadPercent).toBeGreaterThan(99.9);
    expect(stats.loadPercent).toBeLessThanOrEqual(100);
  });
});
