import { describe, expect, it } from "vitest";
import * as engine from "./index";

describe("engine public API", () => {
  it("exports the names of the shared contract", () => {
    for (const name of [
      "parseGroupAddress",
      "formatGroupAddress",
      "parseIndividualAddress",
      "formatIndividualAddress",
      "getDpt",
      "dptSizeBits",
      "encodeTp1Frame",
      "decodeTp1Frame",
      "describeTelegram",
      "loadBench",
      "registerDeviceType",
      "getDeviceType",
      "listDeviceTypes",
      "createSimulation",
    ]) {
      expect(typeof (engine as Record<string, unknown>)[name], name).toBe("function");
    }
    expect(engine.benchSchema.safeParse({}).success).toBe(false);
    expect(engine.dptIds).toContain("9.001");
  });

  it("runs a bench end to end through the public API alone", () => {
    const sim = engine.createSimulation(
      {
        format: 1,
        name: "Smoke",
        lines: [{ id: "main", address: "1.1", name: "Main" }],
        testToolAddress: "1.1.250",
        groupAddresses: [{ address: "1/0/1", name: "Light", dpt: "1.001" }],
        devices: [
          { id: "act", type: "switch-actuator", name: "Relay", individualAddress: "1.1.2" },
        ],
        links: [{ device: "act", object: 0, groupAddress: "1/0/1" }],
      },
      { seed: 1 },
    );
    expect(sim.sendGroupWrite("1/0/1", true).ok).toBe(true);
    sim.runUntilIdle();
    expect(sim.deviceState("act")).toEqual({ on: [true] });
    expect(engine.filterTrace(sim.trace, { kinds: ["telegram.acked"] })).toHaveLength(1);
  });
});
