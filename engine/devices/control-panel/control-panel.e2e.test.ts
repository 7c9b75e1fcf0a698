import { describe, expect, it } from "vitest";
import type { BenchInput } from "../../bench/bench-schema";
import { checkBench } from "../../checks/check-bench";
import { benchSchema } from "../../bench";
import { createSimulation } from "../../sim";

const S = 1_000_000;

/** A control panel driving one switch actuator channel, with the channel's status wired back to the tile. */
function panelBench(): BenchInput {
  return {
    format: 1,
    name: "Panel lab",
    lines: [{ id: "main", address: "1.1", name: "Lab line" }],
    testToolAddress: "1.1.250",
    groupAddresses: [
      { address: "1/0/1", dpt: "1.001", name: "Light switch" },
      { address: "1/1/1", dpt: "1.001", name: "Light status" },
      { address: "1/0/2", dpt: "5.001", name: "Blind position" },
    ],
    devices: [
      {
        id: "cp",
        type: "control-panel",
        name: "Control panel",
        individualAddress: "1.1.40",
        parameters: {
          tiles: [
            { label: "Light", dpt: "1.001", kind: "toggle" },
            { label: "Light status", dpt: "1.001", kind: "status" },
            { label: "Blind 40 %", dpt: "5.001", kind: "value", value: 40 },
          ],
        },
      },
      {
        id: "act",
        type: "switch-actuator",
        name: "Actuator",
        individualAddress: "1.1.10",
        parameters: { channels: 1, statusObjects: true },
      },
    ],
    links: [
      { device: "cp", object: 0, groupAddress: "1/0/1" },
      { device: "cp", object: 0, groupAddress: "1/1/1" },
      { device: "cp", object: 1, groupAddress: "1/1/1" },
      { device: "cp", object: 2, groupAddress: "1/0/2" },
      { device: "act", object: 0, groupAddress: "1/0/1" },
      { device: "act", object: 1, groupAddress: "1/1/1" },
    ],
    unitLinks: [],
  };
}

describe("control panel on a simulated line", () => {
  it("is the sender the bench checks look for on its command address", () => {
    const findings = checkBench(benchSchema.parse(panelBench()));
    expect(
      findings.filter((f) => f.rule === "address.no-sender").map((f) => f.location.groupAddress),
    ).toEqual([]);
  });

  it("a toggle tile switches the actuator, hears its status, and the next press switches off", () => {
    const sim = createSimulation(panelBench(), { seed: 1 });
    sim.runFor(1 * S);
    expect(sim.pressButton("cp", "tile-1")).toEqual({ ok: true, value: undefined });
    sim.runFor(1 * S);
    // DPT spec §4 1.001: 1 = on; the actuator's status write reached both tiles.
    expect(sim.groupValue("1/1/1")).toBe(true);
    expect(sim.objectValue("cp", 0)).toBe(true);
    expect(sim.objectValue("cp", 1)).toBe(true);
    sim.pressButton("cp", "tile-1");
    sim.runFor(1 * S);
    expect(sim.groupValue("1/1/1")).toBe(false);
    expect(sim.objectValue("cp", 1)).toBe(false);
  });

  it("a status tile has no button, and a value tile writes its preset", () => {
    const sim = createSimulation(panelBench(), { seed: 1 });
    sim.runFor(1 * S);
    const refused = sim.pressButton("cp", "tile-2");
    expect(refused.ok ? "" : refused.error.field).toBe("button");
    sim.pressButton("cp", "tile-3");
    sim.runFor(1 * S);
    // DPT spec §3.4 5.001: 40 % travels as round(40 * 255 / 100) = 102 and reads back as 40 %.
    expect(sim.groupValue("1/0/2")).toBe(40);
  });
});
