import { describe, expect, it } from "vitest";
import type { BenchInput } from "../../bench/bench-schema";
import { createSimulation, type Simulation } from "../../sim";
import { hvacGatewayParametersSchema } from "./parameters";
import { gatewayObjects as O } from "./objects";

const S = 1_000_000;

/** A primary gateway taking the room temperature from KNX (3/0/1), its unit on link "wiring"; fault on 3/1/6, text 3/1/7. */
function supervisedBench(gateway: Record<string, unknown> = {}): BenchInput {
  return {
    format: 1,
    name: "Supervision lab",
    lines: [{ id: "main", address: "1.1", name: "Lab line" }],
    testToolAddress: "1.1.250",
    groupAddresses: [
      { address: "3/0/1", dpt: "9.001", name: "External room temperature" },
      { address: "3/1/6", dpt: "1.005", name: "Fault" },
      { address: "3/1/7", dpt: "16.000", name: "Fault text" },
    ],
    devices: [
      {
        id: "gw",
        type: "hvac-gateway",
        name: "Gateway",
        individualAddress: "1.1.11",
        parameters: {
          roomTemperatureSource: "external",
          unitTimeoutS: 30,
          externalTemperatureTimeoutS: 120,
          ...gateway,
        },
      },
      { id: "unit", type: "indoor-unit", name: "Indoor unit", parameters: { initialRoomC: 18 } },
    ],
    links: [
      { device: "gw", object: O.externalRoomTemperature, groupAddress: "3/0/1" },
      { device: "gw", object: O.fault, groupAddress: "3/1/6" },
      { device: "gw", object: O.faultText, groupAddress: "3/1/7" },
    ],
    unitLinks: [{ id: "wiring", members: ["gw", "unit"] }],
  };
}

const transitions = (sim: Simulation, device: string) =>
  sim.trace.flatMap((e) =>
    e.kind === "device.transition" && e.deviceId === device ? [e.transition] : [],
  );
const unitState = (sim: Simulation) =>
  sim.deviceState("unit") as { externalRoomC: number | null; roomC: number };

// Common practice, no published source: a gateway supervises the wired link to its unit and
// reports a lost unit on its fault objects, clearing it when communication returns.
describe("gateway supervision of the indoor unit", () => {
  it("a broken link raises gateway.unit-lost within the supervision time, and clears when it returns", () => {
    const sim = createSimulation(supervisedBench(), { seed: 1 });
    sim.runFor(15 * S);
    expect(sim.groupValue("3/1/6")).not.toBe(true);
    expect(sim.injectFault("wiring", "link.broken").ok).toBe(true);
    // The unit's last word came at most 10 s before the break; 30 s of silence later the fault is up.
    sim.runFor(30 * S);
    expect(sim.groupValue("3/1/6")).toBe(true);
    expect(sim.groupValue("3/1/7")).toBe("unit lost");
    expect(transitions(sim, "gw")).toContain("gateway.unit-lost");
    expect(sim.clearFault("wiring", "link.broken").ok).toBe(true);
    // The unit says it is alive every 10 s.
    sim.runFor(11 * S);
    expect(sim.groupValue("3/1/6")).toBe(false);
    expect(sim.groupValue("3/1/7")).toBe("");
    expect(transitions(sim, "gw")).toContain("unit.communication-restored");
  });

  it("an intact link never raises it, however long the run", () => {
    const sim = createSimulation(supervisedBench({ externalTemperatureTimeoutS: 0 }), { seed: 1 });
    sim.runFor(600 * S);
    expect(transitions(sim, "gw")).not.toContain("gateway.unit-lost");
  });

  it("refuses a supervision time shorter than the unit's 10 s report period, naming the field", () => {
    const parsed = hvacGatewayParametersSchema.safeParse({ unitTimeoutS: 10 });
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues[0]?.path).toEqual(["unitTimeoutS"]);
  });
});

// Common practice, no published source: a controller that loses its external room temperature
// falls back to the unit's own sensor rather than control on a stale value, and says so.
describe("external room temperature supervision", () => {
  it("falls back to the unit's own sensor after the configured time and reports it; a new value restores it", () => {
    const sim = createSimulation(supervisedBench(), { seed: 1 });
    sim.runFor(1 * S);
    sim.sendGroupWrite("3/0/1", 25);
    sim.runFor(1 * S);
    expect(unitState(sim).externalRoomC).toBe(25);
    sim.runFor(100 * S);
    expect(unitState(sim).externalRoomC).toBe(25);
    sim.runFor(30 * S);
    expect(unitState(sim).externalRoomC).toBeNull();
    expect(sim.groupValue("3/1/6")).toBe(true);
    expect(sim.groupValue("3/1/7")).toBe("ext temp lost");
    sim.sendGroupWrite("3/0/1", 24);
    sim.runFor(1 * S);
    expect(unitState(sim).externalRoomC).toBe(24);
    expect(sim.groupValue("3/1/6")).toBe(false);
  });

  it("with the timeout at 0 keeps the last value (the behaviour before supervision)", () => {
    const sim = createSimulation(supervisedBench({ externalTemperatureTimeoutS: 0 }), { seed: 1 });
    sim.runFor(1 * S);
    sim.sendGroupWrite("3/0/1", 25);
    sim.runFor(600 * S);
    expect(unitState(sim).externalRoomC).toBe(25);
  });
});

describe("fault objects on return", () => {
  it("send the cleared fault once, not once per message that restores the link", () => {
    const sim = createSimulation(supervisedBench({ externalTemperatureTimeoutS: 0 }), { seed: 1 });
    sim.runFor(15 * S);
    sim.injectFault("wiring", "link.broken");
    sim.runFor(40 * S);
    sim.clearFault("wiring", "link.broken");
    sim.runFor(30 * S);
    // 3/1/6 as a raw group address: 3 << 11 | 1 << 8 | 6 (knx-reference.md "Addresses").
    const faultWrites = sim.trace.filter(
      (e) => e.kind === "telegram.queued" && e.deviceId === "gw" && e.destination === 6406,
    );
    // DPT spec §3.1 (1.005): 01 alarm when lost, 00 when it returns; nothing else but the
    // start-up status (00, no fault) sent once after the start-up delay.
    expect(faultWrites.map((e) => (e.kind === "telegram.queued" ? e.payloadHex : ""))).toEqual([
      "00",
      "01",
      "00",
    ]);
  });
});
