import { describe, expect, it } from "vitest";
import { DeviceHarness } from "../../../test/harness/device-harness";
import {
  CONTROLLER_ANNOUNCE_PERIOD_US,
  LINK_SUPERVISION_GRACE_US,
} from "../hvac/unit-link-messages";
import { indoorUnitType } from "../indoor-unit/indoor-unit";
import type { IndoorUnitState } from "../indoor-unit/state";
import { wallControllerParametersSchema } from "./parameters";
import { wallControllerType, type WallControllerState } from "./wall-controller";

const MS = 1_000;

function bench(second: "primary" | "secondary" | "none" = "none") {
  const members = [
    { id: "unit", type: indoorUnitType, parameters: { initialSetpointC: 22 } },
    { id: "wc", type: wallControllerType, parameters: { role: "primary" } },
    ...(second === "none"
      ? []
      : [{ id: "wc2", type: wallControllerType, parameters: { role: second } }]),
  ];
  const harness = new DeviceHarness(members, [
    { id: "link", members: members.map((m) => m.id) },
  ]).start();
  harness.advance(50 * MS);
  const press = (button: string, device = "wc") => {
    harness.press(device, button);
    harness.advance(50 * MS);
  };
  return {
    harness,
    press,
    unit: () => harness.state<IndoorUnitState>("unit"),
    wc: (id = "wc") => harness.state<WallControllerState>(id),
  };
}

describe("wall controller keys", () => {
  it("switches the unit on and off with the power key", () => {
    const { press, unit, wc } = bench();
    press("power");
    expect(unit().power).toBe(true);
    expect(wc().display?.power).toBe(true);
    press("power");
    expect(unit().power).toBe(false);
  });

  it("steps the setpoint by 0.5 K and clamps at the limits", () => {
    // Common practice, no published source: 0.5 K per key press.
    const { press, unit, harness } = bench();
    press("setpoint-up");
    expect(unit().setpointC).toBe(22.5);
    press("setpoint-down");
    press("setpoint-down");
    expect(unit().setpointC).toBe(21.5);
    for (let i = 0; i < 20; i++) press("setpoint-up");
    expect(unit().setpointC).toBe(30);
    expect(harness.transitionNames("wc")).toContain("setpoint.clamped");
  });

  it("steps through the modes auto, heat, cool, fan, dry", () => {
    const { press, unit } = bench();
    const seen: string[] = [];
    for (let i = 0; i < 5; i++) {
      press("mode");
      seen.push(unit().mode);
    }
    expect(seen).toEqual(["heat", "cool", "fan", "dry", "auto"]);
  });
});

describe("wall controller roles", () => {
  it("shows link.two-primaries with a second primary, stops commands, and clears when one is made secondary", () => {
    // Common practice, no published source: one primary per indoor unit; a second primary is a fault.
    const { harness, press, unit, wc } = bench("primary");
    expect(wc().faults).toContain("link.two-primaries");
    expect(wc("wc2").faults).toContain("link.two-primaries");
    expect(harness.faults.get("wc")?.has("link.two-primaries")).toBe(true);

    press("power");
    expect(unit().power).toBe(false);
    expect(harness.transitionNames("wc")).toContain("link.command-refused");

    harness.setParameter("wc2", "role", "secondary");
    harness.advance(CONTROLLER_ANNOUNCE_PERIOD_US + 50 * MS);
    expect(wc().faults).toEqual([]);
    expect(harness.faults.get("wc")?.size).toBe(0);
    press("power");
    expect(unit().power).toBe(true);
  });

  it("lets a secondary command the unit next to a primary", () => {
    const { press, unit } = bench("secondary");
    press("power", "wc2");
    expect(unit().power).toBe(true);
  });

  it("shows lost communication when its role is changed to secondary and no primary is left", () => {
    const { harness, wc } = bench();
    harness.setParameter("wc", "role", "secondary");
    harness.advance(LINK_SUPERVISION_GRACE_US + 50 * MS);
    expect(wc().faults).toContain("link.no-primary");
  });
});

describe("wall controller parameters", () => {
  it("fill defaults from {}", () => {
    expect(wallControllerParametersSchema.parse({})).toEqual({
      role: "primary",
      setpointStepK: 0.5,
      setpointMinC: 16,
      setpointMaxC: 30,
    });
  });

  it("refuse inverted setpoint limits with a message naming both fields", () => {
    const parsed = wallControllerParametersSchema.safeParse({ setpointMinC: 28, setpointMaxC: 18 });
    expect(parsed.success).toBe(false);
    expect(parsed.error?.issues[0]?.path).toEqual(["setpointMinC"]);
    expect(parsed.error?.issues[0]?.message).toBe(
      "setpointMinC (28 °C) must be below setpointMaxC (18 °C)",
    );
  });
});
