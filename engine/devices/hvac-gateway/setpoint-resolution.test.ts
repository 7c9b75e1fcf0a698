import { describe, expect, it } from "vitest";
import { unitSetpointC } from "../indoor-unit/parameters";
import { indoorUnitParametersSchema } from "../indoor-unit/parameters";
import { gatewayFixture } from "./gateway-fixture";
import { gatewayObjects as O } from "./objects";

// Common practice, no published source: units take setpoints in 0.5 K or 1 K steps
// and their controllers report the value the unit took, not the value commanded.
describe("setpoint resolution of the indoor unit", () => {
  it("rounds to the nearest step, halves up, inside 5..40 °C", () => {
    expect(unitSetpointC(21.3, 0.5)).toBe(21.5);
    expect(unitSetpointC(21.2, 0.5)).toBe(21);
    expect(unitSetpointC(21.25, 0.5)).toBe(21.5);
    expect(unitSetpointC(21.4, 1)).toBe(21);
    expect(unitSetpointC(21.5, 1)).toBe(22);
    expect(unitSetpointC(41, 1)).toBe(40);
  });

  it("is a unit parameter of 0.5 K or 1 K, 0.5 K by default", () => {
    expect(indoorUnitParametersSchema.parse({}).setpointResolutionK).toBe(0.5);
    const refused = indoorUnitParametersSchema.safeParse({ setpointResolutionK: 0.2 });
    expect(refused.success ? "" : refused.error.issues[0]!.message).toBe(
      "setpointResolutionK must be 0.5 or 1",
    );
  });

  it("the gateway's setpoint status echoes the value the unit took (21.3 -> 21.5 at 0.5 K)", () => {
    const f = gatewayFixture({ unit: { setpointResolutionK: 0.5 } });
    f.write(O.setpoint, 21.3);
    expect(f.unit().setpointC).toBe(21.5);
    expect(f.lastSent(O.setpointStatus)).toBe(21.5);
  });

  it("at 1 K, 22.4 is taken as 22 and reported so, even though the command differed", () => {
    const f = gatewayFixture({ unit: { setpointResolutionK: 1, initialSetpointC: 22 } });
    f.write(O.setpoint, 22.4);
    // The unit's setpoint did not change, yet the status is sent so the visualisation snaps back.
    expect(f.sent(O.setpointStatus)).toEqual([22]);
  });
});
