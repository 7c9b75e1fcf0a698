import { describe, expect, it } from "vitest";
import { gatewayFixture } from "./gateway-fixture";
import { gatewayGroupObjects, gatewayObjects as O } from "./objects";
import { hvacGatewayParametersSchema } from "./parameters";

// DPT spec §3.10 (9.002 temperature difference, K) and §3.6 (6.010 counter, signed); the
// behaviour (base plus shift, shift cleared by a new absolute setpoint) is common practice,
// no published source.
describe("setpoint shift", () => {
  it("declares the shift objects on 9.002 or 6.010, none when off", () => {
    const dpts = (setpointShift: string) =>
      gatewayGroupObjects(hvacGatewayParametersSchema.parse({ setpointShift }))
        .filter((o) => o.number === O.setpointShift || o.number === O.setpointShiftStatus)
        .map((o) => o.dpt);
    expect(dpts("off")).toEqual([]);
    expect(dpts("kelvin")).toEqual(["9.002", "9.002"]);
    expect(dpts("steps")).toEqual(["6.010", "6.010"]);
  });

  it("kelvin: +1.5 K on 21 °C runs 22.5 °C; a shift beyond the maximum is held at it", () => {
    const f = gatewayFixture({ gateway: { setpointShift: "kelvin", setpointShiftMaxK: 3 } });
    f.write(O.setpoint, 21);
    f.write(O.setpointShift, 1.5);
    expect(f.unit().setpointC).toBe(22.5);
    expect(f.lastSent(O.setpointStatus)).toBe(22.5);
    expect(f.lastSent(O.setpointShiftStatus)).toBe(1.5);
    f.write(O.setpointShift, -5);
    expect(f.unit().setpointC).toBe(18);
    expect(f.lastSent(O.setpointShiftStatus)).toBe(-3);
  });

  it("steps: -2 steps of 0.5 K on 21 °C runs 20 °C and reports -2", () => {
    const f = gatewayFixture({ gateway: { setpointShift: "steps", setpointShiftStepK: 0.5 } });
    f.write(O.setpoint, 21);
    f.write(O.setpointShift, -2);
    expect(f.unit().setpointC).toBe(20);
    expect(f.lastSent(O.setpointShiftStatus)).toBe(-2);
  });

  it("the limits win over the shift, and the status reports the shift that was left", () => {
    const f = gatewayFixture({
      gateway: { setpointShift: "kelvin", setpointMaxC: 24 },
    });
    f.write(O.setpoint, 23);
    f.write(O.setpointShift, 2);
    expect(f.unit().setpointC).toBe(24);
    expect(f.lastSent(O.setpointShiftStatus)).toBe(1);
  });

  it("a new absolute setpoint clears the shift", () => {
    const f = gatewayFixture({ gateway: { setpointShift: "kelvin" } });
    f.write(O.setpoint, 21);
    f.write(O.setpointShift, 1);
    f.write(O.setpoint, 20);
    expect(f.unit().setpointC).toBe(20);
    expect(f.lastSent(O.setpointShiftStatus)).toBe(0);
  });
});
