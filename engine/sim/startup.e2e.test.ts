import { describe, expect, it } from "vitest";
import { parseGroupAddress } from "../address";
import { loadBench } from "../bench";
import type { BenchInput } from "../bench/bench-schema";
import type { TraceEvent } from "../core/trace";
import { gatewayObjects as O } from "../devices/hvac-gateway/objects";
import { STARTUP_STAGGER_US_PER_DEVICE } from "./device-runtime";
import { BUS_FAULTS, createSimulation, type Simulation } from "./simulation";

const S = 1_000_000;
const raw = (address: string) => {
  const parsed = parseGroupAddress(address);
  if (!parsed.ok) throw new Error(address);
  return parsed.value;
};

/**
 * Two gateways (1.1.20, 1.1.21) with their units, each with power, setpoint and fault status on
 * the bus, and an external room temperature input flagged read-on-init (with the transmit flag a
 * read needs); a 2-channel switch actuator (1.1.10) with status objects.
 */
function lineOfGateways(startupDelayS?: number): BenchInput {
  const delay = startupDelayS === undefined ? {} : { startupDelayS };
  const gateway = (n: number) => ({
    id: `gw${n}`,
    type: "hvac-gateway",
    name: `Gateway ${n}`,
    individualAddress: `1.1.${19 + n}`,
    parameters: { roomTemperatureSource: "external", externalTemperatureTimeoutS: 0, ...delay },
    objectFlags: { [String(O.externalRoomTemperature)]: { transmit: true } },
  });
  const statuses = (n: number) => [
    { device: `gw${n}`, object: O.powerStatus, groupAddress: `${n + 1}/1/0` },
    { device: `gw${n}`, object: O.setpointStatus, groupAddress: `${n + 1}/1/1` },
    { device: `gw${n}`, object: O.fault, groupAddress: `${n + 1}/1/6` },
    { device: `gw${n}`, object: O.externalRoomTemperature, groupAddress: "4/1/2" },
  ];
  return {
    format: 1,
    name: "A line of gateways",
    lines: [{ id: "main", address: "1.1", name: "Line" }],
    testToolAddress: "1.1.250",
    groupAddresses: [
      { address: "1/1/1", dpt: "1.001", name: "Light 1 status" },
      { address: "1/1/2", dpt: "1.001", name: "Light 2 status" },
      { address: "4/1/2", dpt: "9.001", name: "Room temperature" },
      ...[2, 3].flatMap((main) => [
        { address: `${main}/1/0`, dpt: "1.001", name: `Power status ${main}` },
        { address: `${main}/1/1`, dpt: "9.001", name: `Setpoint status ${main}` },
        { address: `${main}/1/6`, dpt: "1.005", name: `Fault ${main}` },
      ]),
    ],
    devices: [
      gateway(1),
      gateway(2),
      { id: "iu1", type: "indoor-unit", name: "Unit 1", parameters: {} },
      { id: "iu2", type: "indoor-unit", name: "Unit 2", parameters: {} },
      {
        id: "act",
        type: "switch-actuator",
        name: "Lights",
        individualAddress: "1.1.10",
        parameters: { channels: 2, ...delay },
      },
    ],
    links: [
      ...statuses(1),
      ...statuses(2),
      { device: "act", object: 1, groupAddress: "1/1/1" },
      { device: "act", object: 3, groupAddress: "1/1/2" },
    ],
    unitLinks: [
      { id: "wiring-1", members: ["gw1", "iu1"] },
      { id: "wiring-2", members: ["gw2", "iu2"] },
    ],
  };
}

type Queued = Extract<TraceEvent, { kind: "telegram.queued" }>;
const queued = (sim: Simulation, deviceId: string, service?: string) =>
  sim.trace.filter(
    (e): e is Queued =>
      e.kind === "telegram.queued" &&
      e.deviceId === deviceId &&
      (service === undefined || e.service === service),
  );

// Common practice, no published source: after bus voltage returns a KNX device waits a
// configurable delay, then sends its status objects once and reads its read-on-init objects;
// the line's devices are spread out by address so they do not all send at once.
describe("start-up after bus power returns", () => {
  it("at first start, each status is sent once after the delay plus the device's stagger, then read-on-init objects are read", () => {
    const sim = createSimulation(lineOfGateways(2), { seed: 1 });
    sim.runFor(20 * S);
    const startOf = (device: number) => 2 * S + device * STARTUP_STAGGER_US_PER_DEVICE;
    for (const [id, device, main] of [
      ["gw1", 20, 2],
      ["gw2", 21, 3],
    ] as const) {
      const writes = queued(sim, id, "GroupValue_Write");
      // Power status (off), setpoint status (the unit's) and fault (none) once each, at the
      // device's start-up moment; before it the gateway only stored what its unit reported.
      const atStart = writes.filter((w) => w.timeUs === startOf(device));
      expect(atStart.map((w) => w.destination)).toEqual([
        raw(`${main}/1/0`),
        raw(`${main}/1/1`),
        raw(`${main}/1/6`),
      ]);
      expect(writes).toHaveLength(3);
      expect(writes.filter((w) => w.destination === raw(`${main}/1/0`))).toHaveLength(1);
      expect(writes.filter((w) => w.destination === raw(`${main}/1/1`))).toHaveLength(1);
      // Read-on-init: one read of the external temperature, at the same moment and not before.
      const reads = queued(sim, id, "GroupValue_Read");
      expect(reads.map((r) => [r.timeUs, r.destination])).toEqual([
        [startOf(device), raw("4/1/2")],
      ]);
    }
    // The actuator (1.1.10) reports both channels' status, before the gateways.
    const act = queued(sim, "act", "GroupValue_Write");
    expect(act.map((w) => [w.timeUs, w.destination])).toEqual([
      [2 * S + 10 * STARTUP_STAGGER_US_PER_DEVICE, raw("1/1/1")],
      [2 * S + 10 * STARTUP_STAGGER_US_PER_DEVICE, raw("1/1/2")],
    ]);
  });

  it("the delay is a parameter: with 10 s nothing is reported before 10 s", () => {
    const sim = createSimulation(lineOfGateways(10), { seed: 1 });
    sim.runFor(10 * S);
    expect(queued(sim, "act")).toEqual([]);
    sim.runFor(1 * S);
    expect(queued(sim, "act")).toHaveLength(2);
  });

  it("after a bus fault is cleared the device reports its statuses again once, and reads again", () => {
    const sim = createSimulation(lineOfGateways(2), { seed: 1 });
    sim.runFor(20 * S);
    expect(sim.injectFault("gw1", BUS_FAULTS.silent).ok).toBe(true);
    sim.sendGroupWrite("4/1/2", 22.5); // the gateway misses it while cut off
    sim.runFor(30 * S);
    const before = queued(sim, "gw1").length;
    const clearedAtUs = sim.nowUs;
    expect(sim.clearFault("gw1", BUS_FAULTS.silent).ok).toBe(true);
    sim.runFor(1 * S);
    expect(queued(sim, "gw1").length).toBe(before); // still in its start-up delay
    sim.runFor(10 * S);
    const after = queued(sim, "gw1").filter((e) => e.timeUs > clearedAtUs);
    const at = clearedAtUs + 2 * S + 20 * STARTUP_STAGGER_US_PER_DEVICE;
    expect(after.every((e) => e.timeUs === at)).toBe(true);
    expect(after.map((e) => [e.service, e.destination])).toEqual(
      expect.arrayContaining([
        ["GroupValue_Write", raw("2/1/0")],
        ["GroupValue_Write", raw("2/1/1")],
        ["GroupValue_Write", raw("2/1/6")],
        ["GroupValue_Read", raw("4/1/2")],
      ]),
    );
    expect(after).toHaveLength(4);
  });

  it("a device still cut off when its delay ends reports nothing until the fault is cleared", () => {
    const sim = createSimulation(lineOfGateways(2), { seed: 1 });
    expect(sim.injectFault("act", BUS_FAULTS.silent).ok).toBe(true);
    sim.runFor(20 * S);
    expect(queued(sim, "act")).toEqual([]);
    sim.clearFault("act", BUS_FAULTS.silent);
    sim.runFor(5 * S);
    expect(queued(sim, "act")).toHaveLength(2);
  });

  it("refuses a start-up delay outside 0..600 s, naming the field", () => {
    const bench = lineOfGateways(-1);
    const loaded = loadBench(bench);
    expect(loaded.ok).toBe(false);
    if (!loaded.ok) expect(loaded.error[0]!.path).toBe("devices[0].parameters.startupDelayS");
  });
});
