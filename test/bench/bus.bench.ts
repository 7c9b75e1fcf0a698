/**
 * Bus benchmark: `npm run bench:bus`.
 *
 * 1. Saturated line. The test tool keeps a queue of 1-bit writes to eight group
 *    addresses; 64 eight-channel switch actuators listen, channel c on 1/0/(c+1),
 *    so each telegram reaches 64 write-flag objects. The line runs at its
 *    maximum rate (9600/193 ≈ 49.7 telegrams per virtual second), and the figure
 *    that matters is group-telegram deliveries (a write handed to an object with
 *    the write flag, device transition included) per wall-clock second.
 * 2. A 24-hour day of a 64-device line: 48 room sensors (sample every 10 s, send
 *    on a change of 0.2 K at most every 30 s, and every 10 minutes), 8 push-buttons
 *    pressed by occupants through the day and 8 switch actuators with status
 *    feedback to the rockers.
 *
 * Each runs with the trace off (capacity 0: no event objects are built) and with
 * a 100,000-event ring, the live console's setting, to show what recording costs.
 * Targets: >= 1,000,000 deliveries per second; the day in under 2 s.
 */
import { z } from "zod";
import type { BenchInput } from "../../engine";
import { createRng } from "../../engine";
import { registerDeviceType } from "../../engine";
import { flags, type DeviceType } from "../../engine";
import { createSimulation } from "../../engine";
import { benchBuilder } from "../harness/bench-builder";
import { startClock } from "./stopwatch";

const TARGET_DELIVERIES_PER_S = 1_000_000;

const TARGET_DAY_WALL_S = 2;
const DAY_US = 24 * 3_600_000_000;

// ---------------------------------------------------------------- 1. saturated line

function saturatedBench(): BenchInput {
  const b = benchBuilder();
  for (let c = 1; c <= 8; c++) b.groupAddress(`1/0/${c}`, "1.001");
  for (let d = 1; d <= 64; d++) {
    b.device(`act-${d}`, "switch-actuator", `1.1.${d}`, { channels: 8, statusObjects: false });
    for (let c = 0; c < 8; c++) b.link(`act-${d}`, 2 * c, `1/0/${c + 1}`);
  }
  return b.build();
}

function runSaturated(traceCapacity: number, virtualSeconds: number) {
  const sim = createSimulation(saturatedBench(), { seed: 1, traceCapacity });
  let sent = 0;
  const clock = startClock();
  for (let second = 0; second < virtualSeconds; second++) {
    // Keep the queue ahead of the line: a little more than one second's worth each second.
    for (let i = 0; i < 60; i++, sent++)
      sim.sendGroupWrite(1 * 2048 + 1 + (sent % 8), (sent >> 3) % 2 === 0);
    sim.runFor(1_000_000);
  }
  const { wallS, cpuS } = clock();
  const stats = sim.busStats(virtualSeconds * 1_000_000);
  return {
    wallS,
    cpuS,
    virtualS: virtualSeconds,
    deliveries: sim.deliveries,
    telegrams: stats.telegrams,
    loadPercent: stats.loadPercent,
  };
}

// ---------------------------------------------------------------- 2. a day on a 64-device line

interface SensorState {
  readonly temperatureC: number;
  readonly lastSentC: number;
  readonly lastSentUs: number;
}

const SAMPLE_US = 10_000_000;
const CYCLE_US = 600_000_000;
const MIN_INTERVAL_US = 30_000_000; // common practice, no published source (knx-reference.md, trade practice)
const DELTA_C = 0.2;

function roundToHundredths(x: number): number {
  return Math.round(x * 100) / 100;
}

/** A room sensor of the benchmark's own: a random walk sent on change and cyclically. */
const benchSensorType: DeviceType<{ startC: number }, SensorState> = {
  id: "bench-room-sensor",
  label: "Benchmark room sensor",
  description: "Random-walk temperature sent on change and cyclically; benchmark only.",
  medium: "knx",
  parameters: z.object({ startC: z.number().default(21) }),
  groupObjects: () => [
    { number: 0, name: "Temperature", dpt: "9.001", flags: flags("CRT"), role: "status" },
  ],
  buttons: () => [],
  initialState: (p) => ({ temperatureC: p.startC, lastSentC: p.startC, lastSentUs: 0 }),
  transition(state, event, context) {
    switch (event.kind) {
      case "start":
        return {
          state,
          effects: [
            { kind: "object.store", object: 0, value: state.temperatureC },
            { kind: "timer.set", name: "sample", delayUs: SAMPLE_US },
            { kind: "timer.set", name: "cycle", delayUs: CYCLE_US },
          ],
        };
      case "timer": {
        if (event.name === "cycle") {
          return {
            state: { ...state, lastSentC: state.temperatureC, lastSentUs: context.nowUs },
            effects: [
              { kind: "group.send", object: 0, service: "write", value: state.temperatureC },
              { kind: "timer.set", name: "cycle", delayUs: CYCLE_US },
            ],
          };
        }
        const temperatureC = roundToHundredths(state.temperatureC + (context.random() - 0.5) * 0.1);
        const due =
          Math.abs(temperatureC - state.lastSentC) >= DELTA_C &&
          context.nowUs - state.lastSentUs >= MIN_INTERVAL_US;
        return due
          ? {
              state: { temperatureC, lastSentC: temperatureC, lastSentUs: context.nowUs },
              effects: [
                { kind: "group.send", object: 0, service: "write", value: temperatureC },
                { kind: "timer.set", name: "sample", delayUs: SAMPLE_US },
              ],
            }
          : {
              state: { ...state, temperatureC },
              effects: [
                { kind: "object.store", object: 0, value: temperatureC },
                { kind: "timer.set", name: "sample", delayUs: SAMPLE_US },
              ],
            };
      }
      default:
        return { state, effects: [] };
    }
  },
};

function dayBench(): BenchInput {
  const b = benchBuilder();
  for (let s = 1; s <= 48; s++) {
    b.groupAddress(`2/0/${s}`, "9.001")
      .device(`sensor-${s}`, "bench-room-sensor", `1.1.${100 + s}`, { startC: 19 + (s % 5) })
      .link(`sensor-${s}`, 0, `2/0/${s}`);
  }
  for (let r = 1; r <= 8; r++) {
    b.groupAddress(`1/1/${r}`, "1.001").groupAddress(`1/2/${r}`, "1.001");
    b.device(`pb-${r}`, "push-button", `1.1.${r}`).link(`pb-${r}`, 0, `1/1/${r}`, `1/2/${r}`);
    b.device(`act-${r}`, "switch-actuator", `1.1.${20 + r}`)
      .link(`act-${r}`, 0, `1/1/${r}`)
      .link(`act-${r}`, 1, `1/2/${r}`);
  }
  return b.build();
}

function runDay(traceCapacity: number) {
  const sim = createSimulation(dayBench(), { seed: 7, traceCapacity });
  const occupants = createRng(99);
  const clock = startClock();
  // Each minute, occupants press a rocker with probability 1/4.
  for (let minute = 0; minute < 24 * 60; minute++) {
    if (occupants.next() < 0.25) sim.pressButton(`pb-${1 + occupants.nextInt(8)}`, "channel-1");
    sim.runFor(60_000_000);
  }
  const { wallS, cpuS } = clock();
  const line = sim.line();
  return {
    wallS,
    cpuS,
    telegrams: line.telegramsTotal,
    deliveries: sim.deliveries,
    loadPercent: (line.occupiedUsTotal / DAY_US) * 100,
    traceEvents: sim.traceStore.appended,
  };
}

// ---------------------------------------------------------------- report

registerDeviceType(benchSensorType);

const fmt = (n: number, digits = 0) =>
  n.toLocaleString("en-US", { maximumFractionDigits: digits, minimumFractionDigits: digits });

// Warm up the JIT so the figures describe steady state, as a long live session would see.
runSaturated(0, 20);
runDay(0);

console.log("Benchline bus benchmark (single thread, virtual time in integer µs)\n");
console.log("1. Saturated line: 64 eight-channel actuators, 64 write-flag objects per telegram");
console.log(
  "   trace            virtual s   wall s    cpu s   telegrams   deliveries   deliveries/wall s   target      ratio   deliveries/cpu s   virtual:wall   load %",
);
for (const [label, capacity] of [
  ["off", 0],
  ["ring 100k", 100_000],
] as const) {
  const r = runSaturated(capacity, 300);
  const perS = r.deliveries / r.wallS;
  console.log(
    `   ${label.padEnd(14)} ${fmt(r.virtualS).padStart(9)} ${fmt(r.wallS, 3).padStart(8)} ${fmt(r.cpuS, 3).padStart(8)} ${fmt(r.telegrams).padStart(11)} ${fmt(r.deliveries).padStart(12)} ${fmt(perS).padStart(19)} ${fmt(TARGET_DELIVERIES_PER_S).padStart(10)} ${fmt(perS / TARGET_DELIVERIES_PER_S, 2).padStart(8)}x ${fmt(r.deliveries / r.cpuS).padStart(18)} ${fmt(r.virtualS / r.wallS).padStart(12)}x ${fmt(r.loadPercent, 2).padStart(8)}`,
  );
}
console.log(
  `   line rate ${fmt(9600 / 193, 2)} telegrams/s expected (9600/193, Basic course timing)\n`,
);

console.log(
  "2. A 24-hour day: 48 room sensors, 8 push-buttons, 8 actuators with status (64 devices)",
);
console.log(
  "   trace            wall s    cpu s   target s   wall/target   virtual:wall   telegrams   deliveries   trace events   load %",
);
for (const [label, capacity] of [
  ["off", 0],
  ["ring 100k", 100_000],
] as const) {
  const r = runDay(capacity);
  console.log(
    `   ${label.padEnd(14)} ${fmt(r.wallS, 3).padStart(8)} ${fmt(r.cpuS, 3).padStart(8)} ${fmt(TARGET_DAY_WALL_S, 1).padStart(10)} ${fmt(r.wallS / TARGET_DAY_WALL_S, 2).padStart(12)}x ${fmt(86_400 / r.wallS).padStart(12)}x ${fmt(r.telegrams).padStart(11)} ${fmt(r.deliveries).padStart(12)} ${fmt(r.traceEvents).padStart(14)} ${fmt(r.loadPercent, 2).padStart(8)}`,
  );
}
