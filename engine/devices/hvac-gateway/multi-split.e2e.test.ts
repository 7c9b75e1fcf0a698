import { describe, expect, it } from "vitest";
import type { BenchInput } from "../../bench/bench-schema";
import { createSimulation } from "../../sim";
import { benchSchema } from "../../bench/bench-schema";
import { checkBench } from "../../checks/check-bench";
import { gatewayObjects as O } from "./objects";

const S = 1_000_000;

/** Two indoor units on one outdoor unit, each with its own multi-split gateway; addresses 2/0/x for unit A, 2/1/x for unit B. */
function multiSplitBench(unitB: { modeControl?: "full" | "simplified" } = {}): BenchInput {
  const addresses = (main: string, unit: string) => [
    { address: `${main}/0`, dpt: "1.001", name: `${unit} power` },
    { address: `${main}/1`, dpt: "1.001", name: `${unit} power status` },
    { address: `${main}/4`, dpt: "20.105", name: `${unit} mode` },
    { address: `${main}/5`, dpt: "20.105", name: `${unit} mode status` },
    { address: `${main}/20`, dpt: "1.002", name: `${unit} mode authority` },
  ];
  const links = (gw: string, main: string) => [
    { device: gw, object: O.power, groupAddress: `${main}/0` },
    { device: gw, object: O.powerStatus, groupAddress: `${main}/1` },
    { device: gw, object: O.mode, groupAddress: `${main}/4` },
    { device: gw, object: O.modeStatus, groupAddress: `${main}/5` },
    { device: gw, object: O.modeAuthority, groupAddress: `${main}/20` },
  ];
  return {
    format: 1,
    name: "Multi-split lab",
    lines: [{ id: "main", address: "1.1", name: "Lab line" }],
    testToolAddress: "1.1.250",
    groupAddresses: [
      ...addresses("2/0", "Unit A"),
      ...addresses("2/1", "Unit B"),
      { address: "2/1/6", dpt: "1.100", name: "Unit B heat/cool" },
      { address: "2/1/7", dpt: "1.100", name: "Unit B heat/cool status" },
      { address: "2/1/21", dpt: "1.002", name: "Unit B mode conflict" },
    ],
    devices: [
      {
        id: "gw-a",
        type: "hvac-gateway",
        name: "Gateway A",
        individualAddress: "1.1.11",
        parameters: { systemType: "multi-split" },
      },
      {
        id: "gw-b",
        type: "hvac-gateway",
        name: "Gateway B",
        individualAddress: "1.1.12",
        parameters: { systemType: "multi-split", ...unitB },
      },
      { id: "unit-a", type: "indoor-unit", name: "Indoor unit A", parameters: {} },
      { id: "unit-b", type: "indoor-unit", name: "Indoor unit B", parameters: {} },
      { id: "outdoor", type: "outdoor-unit", name: "Outdoor unit", parameters: {} },
    ],
    links: [
      ...links("gw-a", "2/0"),
      ...links("gw-b", "2/1").filter((l) => unitB.modeControl !== "simplified" || l.object < 4),
      ...(unitB.modeControl === "simplified"
        ? [
            { device: "gw-b", object: O.heatCool, groupAddress: "2/1/6" },
            { device: "gw-b", object: O.heatCoolStatus, groupAddress: "2/1/7" },
          ]
        : []),
      { device: "gw-b", object: O.modeConflict, groupAddress: "2/1/21" },
    ],
    unitLinks: [
      { id: "wiring-a", members: ["gw-a", "unit-a"] },
      { id: "wiring-b", members: ["gw-b", "unit-b"] },
      { id: "refrigerant", members: ["outdoor", "unit-a", "unit-b"] },
    ],
  };
}

describe("multi-split system on a simulated line", () => {
  it("passes the HVAC bench rules: two units on one outdoor unit, one primary gateway each", () => {
    const hvac = checkBench(benchSchema.parse(multiSplitBench())).filter((f) =>
      /^(indoor-unit|controller|gateway)\./.test(f.rule),
    );
    expect(hvac).toEqual([]);
  });

  it("while unit A heats with mode authority, unit B's cool is refused and its status reports what it runs", () => {
    // Common practice, no published source: while the system heats, the others may heat or fan.
    const sim = createSimulation(multiSplitBench(), { seed: 3 });
    sim.runFor(1 * S);
    sim.sendGroupWrite("2/0/0", true);
    sim.sendGroupWrite("2/0/4", 1);
    sim.runFor(1 * S);
    sim.sendGroupWrite("2/1/0", true);
    sim.sendGroupWrite("2/1/4", 3);
    sim.runFor(1 * S);
    expect(sim.groupValue("2/0/20")).toBe(true);
    expect(sim.objectValue("gw-b", O.modeAuthority)).toBe(false);
    // DPT spec §4 (20.105): 1 heat, 9 fan only.
    expect([1, 9]).toContain(sim.groupValue("2/1/5"));
    expect(
      sim.trace.some(
        (e) =>
          e.kind === "device.transition" &&
          e.deviceId === "unit-b" &&
          e.transition === "system.mode-refused",
      ),
    ).toBe(true);
    expect(
      sim.trace.some(
        (e) =>
          e.kind === "device.transition" &&
          e.deviceId === "gw-b" &&
          e.transition === "system.mode-refused",
      ),
    ).toBe(true);
  });

  it("while unit A cools, unit B may dry", () => {
    // Common practice, no published source: while the system cools, the others may cool, fan or dry.
    const sim = createSimulation(multiSplitBench(), { seed: 3 });
    sim.runFor(1 * S);
    sim.sendGroupWrite("2/0/0", true);
    sim.sendGroupWrite("2/0/4", 3);
    sim.runFor(1 * S);
    sim.sendGroupWrite("2/1/0", true);
    sim.sendGroupWrite("2/1/4", 14);
    sim.runFor(1 * S);
    expect(sim.groupValue("2/1/5")).toBe(14);
  });

  describe("a refused mode on the simplified heat/cool object (DPT 1.100)", () => {
    // Common practice, no published source: a multi-split member whose mode conflicts with the
    // system keeps the request, shows the conflict, and runs what the system allows.
    function heatingSystemWithRearOnHeatCool() {
      const sim = createSimulation(multiSplitBench({ modeControl: "simplified" }), { seed: 3 });
      sim.runFor(1 * S);
      sim.sendGroupWrite("2/0/0", true);
      sim.sendGroupWrite("2/0/4", 1); // DPT spec §4 (20.105): 1 heat
      sim.runFor(1 * S);
      sim.sendGroupWrite("2/1/0", true);
      sim.runFor(1 * S);
      sim.sendGroupWrite("2/1/6", false); // DPT spec §4.2 (1.100): 0 = cooling
      sim.runFor(1 * S);
      return sim;
    }

    it("keeps the request, reports the conflict and sends the heat/cool in force (heating)", () => {
      const sim = heatingSystemWithRearOnHeatCool();
      // Unit B started in auto, which heating does not allow: it only moves air.
      expect((sim.deviceState("unit-b") as { mode: string }).mode).toBe("fan");
      expect(sim.groupValue("2/1/21")).toBe(true);
      // DPT spec §4.2: 1 = heating, the direction the outdoor unit runs, not the cool asked for.
      expect(sim.groupValue("2/1/7")).toBe(true);
      expect((sim.deviceState("gw-b") as { modeRequest: string }).modeRequest).toBe("cool");
    });

    it("runs the kept request once the system cools, and clears the conflict", () => {
      const sim = heatingSystemWithRearOnHeatCool();
      sim.sendGroupWrite("2/0/4", 3); // unit A, holding authority, turns the system to cooling
      sim.runFor(2 * S);
      expect((sim.deviceState("unit-b") as { mode: string }).mode).toBe("cool");
      expect(sim.groupValue("2/1/21")).toBe(false);
      expect(sim.groupValue("2/1/7")).toBe(false);
    });
  });
});
