import { describe, expect, it } from "vitest";
import { DeviceHarness } from "../../../test/harness/device-harness";
import { indoorUnitType } from "./indoor-unit";
import { FROST_BAND_K, indoorUnitParametersSchema } from "./parameters";
import type { IndoorUnitState } from "./state";

const S = 1_000_000;

/** A unit switched off in a cold building: outdoor -10 °C, in a room of its own with time constant τ. */
function coldRoom(frostProtectionC: number, timeConstantS = 1800) {
  const harness = new DeviceHarness(
    [
      {
        id: "unit",
        type: indoorUnitType,
        parameters: {
          initialRoomC: 10,
          outdoorC: -10,
          timeConstantS,
          frostProtectionC,
          initialPower: false,
        },
      },
    ],
    [{ id: "l1", members: ["unit"] }],
  );
  harness.start();
  return { harness, state: () => harness.state<IndoorUnitState>("unit") };
}

// Common practice, no published source: frost / building protection heats a unit that is off
// (or in any mode) when the room falls below a minimum, and stops a band above it. The
// simulator does not replace the manufacturer's instructions or local codes for protecting a
// real building.
describe("frost protection", () => {
  it("holds the room between the minimum and the band above it while the unit is off", () => {
    // A room the unit can hold: C/UA = 12,000 s (engine/room's default room), whose heating
    // equilibrium (G·T_supply + UA·T_out)/(G + UA) lies far above the band.
    const { harness, state } = coldRoom(7, 12_000);
    let lowest = Infinity;
    let highest = -Infinity;
    for (let minute = 1; minute <= 240; minute++) {
      harness.runUntil(minute * 60 * S);
      if (minute > 60) {
        lowest = Math.min(lowest, state().roomC);
        highest = Math.max(highest, state().roomC);
      }
    }
    expect(state().power).toBe(false);
    // One 10 s model step of drift is all it can fall below the minimum.
    expect(lowest).toBeGreaterThan(6.8);
    expect(highest).toBeLessThan(7 + FROST_BAND_K + 0.2);
    const names = harness.transitionNames("unit");
    expect(names).toContain("frost.protection-on");
    expect(names).toContain("frost.protection-off");
  });

  it("off (0), the room falls towards the outdoor temperature", () => {
    const { harness, state } = coldRoom(0);
    harness.runUntil(240 * 60 * S);
    // Newton's law of cooling: -10 + 20·exp(-14400/1800) ≈ -9.99 °C.
    expect(state().roomC).toBeLessThan(-9.9);
  });

  it("refuses a minimum outside 5..12 °C, naming the field", () => {
    const parsed = indoorUnitParametersSchema.safeParse({ frostProtectionC: 3 });
    expect(parsed.success ? [] : parsed.error.issues[0]!.path).toEqual(["frostProtectionC"]);
  });
});
