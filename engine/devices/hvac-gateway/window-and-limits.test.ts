import { describe, expect, it } from "vitest";
import { gatewayFixture } from "./gateway-fixture";
import { gatewayObjects as O } from "./objects";
import { hvacGatewayParametersSchema } from "./parameters";

const S = 1_000_000;

// Common practice, no published source: a window contact input with a delay, so a short airing
// does not cycle the unit, and an inversion for contacts wired normally closed.
describe("window contact delay and polarity", () => {
  it("stops the unit only once the window has stayed open for the delay", () => {
    const f = gatewayFixture({
      gateway: { windowContact: true, windowContactDelayS: 60 },
      unit: { initialPower: true },
    });
    f.write(O.windowContact, true); // DPT spec §3.1 (1.019): 1 = open
    f.harness.advance(59 * S);
    expect(f.unit().power).toBe(true);
    f.harness.advance(2 * S);
    f.settle();
    expect(f.unit().power).toBe(false);
    f.write(O.windowContact, false);
    expect(f.unit().power).toBe(true);
  });

  it("a window closed within the delay leaves the unit running", () => {
    const f = gatewayFixture({
      gateway: { windowContact: true, windowContactDelayS: 60 },
      unit: { initialPower: true },
    });
    f.write(O.windowContact, true);
    f.harness.advance(30 * S);
    f.write(O.windowContact, false);
    f.harness.advance(120 * S);
    expect(f.unit().power).toBe(true);
    expect(f.harness.transitionNames("gw")).toContain("window.closed-within-delay");
  });

  it("inverted: 0 means open", () => {
    const f = gatewayFixture({
      gateway: { windowContact: true, windowContactInverted: true },
      unit: { initialPower: true },
    });
    f.write(O.windowContact, false);
    expect(f.unit().power).toBe(false);
    f.write(O.windowContact, true);
    expect(f.unit().power).toBe(true);
  });
});

// Common practice, no published source: energy-saving limits per direction, e.g. heating at
// most 24 °C and cooling at least 22 °C.
describe("setpoint limits per mode", () => {
  const limits = {
    heatingLimits: { setpointMinC: 16, setpointMaxC: 24 },
    coolingLimits: { setpointMinC: 22, setpointMaxC: 30 },
  };

  it("clamps a heating setpoint to the heating limits and a cooling one to the cooling limits", () => {
    const f = gatewayFixture({
      gateway: limits,
      unit: { initialPower: true, initialMode: "heat" },
    });
    f.write(O.setpoint, 27);
    expect(f.lastSent(O.setpointStatus)).toBe(24);
    f.write(O.mode, 3); // DPT spec §4 (20.105): 3 = cool
    f.write(O.setpoint, 19);
    expect(f.lastSent(O.setpointStatus)).toBe(22);
  });

  it("brings the setpoint inside the new limits when the unit changes direction", () => {
    const f = gatewayFixture({
      gateway: limits,
      unit: { initialPower: true, initialMode: "heat" },
    });
    f.write(O.setpoint, 21);
    f.write(O.mode, 3);
    f.settle();
    expect(f.unit().setpointC).toBe(22);
    expect(f.lastSent(O.setpointStatus)).toBe(22);
  });

  it("refuses inverted limits inside a mode, naming the field", () => {
    const parsed = hvacGatewayParametersSchema.safeParse({
      coolingLimits: { setpointMinC: 28, setpointMaxC: 22 },
    });
    expect(parsed.success ? [] : parsed.error.issues[0]!.path).toEqual([
      "coolingLimits",
      "setpointMinC",
    ]);
  });
});
