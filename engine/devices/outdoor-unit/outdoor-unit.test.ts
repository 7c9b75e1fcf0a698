import { describe, expect, it } from "vitest";
import { DeviceHarness, HARNESS_LINK_DELAY_US } from "../../../test/harness/device-harness";
import type { HvacMode } from "../hvac/hvac-mode";
import { indoorUnitType } from "../indoor-unit/indoor-unit";
import type { IndoorUnitState } from "../indoor-unit/state";
import { outdoorUnitType, type OutdoorUnitState } from "./outdoor-unit";

/** Two indoor units on one outdoor unit; their primary controllers ("gw-a", "gw-b") are played by hand. */
function multiSplit(outdoorParameters: Record<string, unknown> = {}) {
  const harness = new DeviceHarness(
    [
      { id: "outdoor", type: outdoorUnitType, parameters: outdoorParameters },
      {
        id: "unit-a",
        type: indoorUnitType,
        parameters: { initialRoomC: 21, initialSetpointC: 21 },
      },
      {
        id: "unit-b",
        type: indoorUnitType,
        parameters: { initialRoomC: 21, initialSetpointC: 21 },
      },
    ],
    [
      { id: "link-a", members: ["unit-a", "gw-a"] },
      { id: "link-b", members: ["unit-b", "gw-b"] },
      { id: "system", members: ["outdoor", "unit-a", "unit-b"] },
    ],
  );
  harness.start();
  const command = (unit: "unit-a" | "unit-b", mode: HvacMode) => {
    const gw = unit === "unit-a" ? "gw-a" : "gw-b";
    const link = unit === "unit-a" ? "link-a" : "link-b";
    const result = harness.dispatch(unit, {
      kind: "link.receive",
      link,
      from: gw,
      message: { kind: "unit.command", power: true, mode },
    });
    harness.advance(10 * HARNESS_LINK_DELAY_US);
    return result;
  };
  for (const [unit, gw, link] of [
    ["unit-a", "gw-a", "link-a"],
    ["unit-b", "gw-b", "link-b"],
  ] as const) {
    harness.dispatch(unit, {
      kind: "link.receive",
      link,
      from: gw,
      message: { kind: "controller.announce", role: "primary", controller: "gateway" },
    });
  }
  harness.advance(10 * HARNESS_LINK_DELAY_US);
  const unit = (id: string) => harness.state<IndoorUnitState>(id);
  return { harness, command, unit, outdoor: () => harness.state<OutdoorUnitState>("outdoor") };
}

describe("outdoor unit mode authority", () => {
  it("gives authority to the first member that heats", () => {
    // Common practice, no published source: one indoor unit holds mode authority.
    const { command, outdoor } = multiSplit();
    command("unit-a", "heat");
    expect(outdoor()).toMatchObject({ authority: "unit-a", direction: "heating" });
  });

  it.each<HvacMode>(["cool", "dry", "auto"])(
    "while the authority heats, refuses %s and leaves the member in heat or fan",
    (mode) => {
      // Common practice, no published source: while the system heats, the others may heat or fan.
      const { command, unit, harness } = multiSplit();
      command("unit-a", "heat");
      const refused = command("unit-b", mode);
      expect(refused.transition).toBe("system.mode-refused");
      expect(["heat", "fan"]).toContain(unit("unit-b").mode);
      expect(
        harness.notes.some(
          (note) => note.device === "unit-b" && note.text.includes(`${mode} refused`),
        ),
      ).toBe(true);
    },
  );

  it("keeps a heating member heating when its cool request is refused", () => {
    const { command, unit } = multiSplit();
    command("unit-a", "heat");
    command("unit-b", "heat");
    command("unit-b", "cool");
    expect(unit("unit-b").mode).toBe("heat");
  });

  it.each<HvacMode>(["heat", "fan"])("while the authority heats, allows %s", (mode) => {
    const { command, unit } = multiSplit();
    command("unit-a", "heat");
    expect(command("unit-b", mode).transition).toBe("unit.command-applied");
    expect(unit("unit-b").mode).toBe(mode);
  });

  it.each<HvacMode>(["cool", "fan", "dry"])("while the authority cools, allows %s", (mode) => {
    // Common practice, no published source: while the system cools, the others may cool, fan or dry.
    const { command, unit } = multiSplit();
    command("unit-a", "cool");
    expect(command("unit-b", mode).transition).toBe("unit.command-applied");
    expect(unit("unit-b").mode).toBe(mode);
  });

  it("while the authority cools, refuses heat", () => {
    const { command, unit } = multiSplit();
    command("unit-a", "cool");
    expect(command("unit-b", "heat").transition).toBe("system.mode-refused");
    expect(unit("unit-b").mode).not.toBe("heat");
  });

  it("moves the other members to fan when the authority changes direction", () => {
    const { command, unit, harness } = multiSplit();
    command("unit-a", "cool");
    command("unit-b", "dry");
    command("unit-a", "heat");
    expect(unit("unit-b").mode).toBe("fan");
    expect(harness.transitionNames("unit-b")).toContain("system.mode-refused");
  });

  it("passes authority on when the holder stops, and frees the system when nobody heats or cools", () => {
    const { harness, command, outdoor } = multiSplit();
    command("unit-a", "cool");
    command("unit-b", "cool");
    harness.dispatch("unit-a", {
      kind: "link.receive",
      link: "link-a",
      from: "gw-a",
      message: { kind: "unit.command", power: false },
    });
    harness.advance(10 * HARNESS_LINK_DELAY_US);
    expect(outdoor()).toMatchObject({ authority: "unit-b", direction: "cooling" });
    harness.dispatch("unit-b", {
      kind: "link.receive",
      link: "link-b",
      from: "gw-b",
      message: { kind: "unit.command", mode: "fan" },
    });
    harness.advance(10 * HARNESS_LINK_DELAY_US);
    expect(outdoor()).toMatchObject({ authority: null, direction: "none" });
    expect(command("unit-a", "heat").transition).toBe("unit.command-applied");
  });

  it("resolves two members asking opposite directions at the same moment in favour of the first heard", () => {
    const { harness, unit, outdoor } = multiSplit();
    harness.dispatch("unit-a", {
      kind: "link.receive",
      link: "link-a",
      from: "gw-a",
      message: { kind: "unit.command", power: true, mode: "heat" },
    });
    harness.dispatch("unit-b", {
      kind: "link.receive",
      link: "link-b",
      from: "gw-b",
      message: { kind: "unit.command", power: true, mode: "cool" },
    });
    harness.advance(20 * HARNESS_LINK_DELAY_US);
    expect(outdoor()).toMatchObject({ authority: "unit-a", direction: "heating" });
    expect(unit("unit-b").mode).toBe("fan");
  });

  it("reports mode authority in the unit status", () => {
    const { command, unit, harness } = multiSplit();
    command("unit-a", "heat");
    expect(unit("unit-a").system?.authority).toBe("unit-a");
    expect(harness.transitionNames("outdoor")).toContain("system.authority-changed");
  });
});

// Common practice, no published source: the three arrangements of mode authority.
describe("outdoor unit mode authority options", () => {
  it("leader: the leading unit decides even when another asked first", () => {
    const { command, unit, outdoor } = multiSplit({
      modeAuthority: "leader",
      leaderUnit: "unit-b",
    });
    command("unit-a", "cool");
    expect(outdoor()).toMatchObject({ authority: null, direction: "none" });
    expect(unit("unit-a").mode).toBe("cool");
    command("unit-b", "heat");
    expect(outdoor()).toMatchObject({ authority: "unit-b", direction: "heating" });
    // The follower may not cool any more (cooling is not allowed while the system heats).
    expect(["heat", "fan"]).toContain(unit("unit-a").mode);
  });

  it("leader: a follower's request against the leader is refused", () => {
    const { command, unit } = multiSplit({ modeAuthority: "leader", leaderUnit: "unit-a" });
    command("unit-a", "heat");
    expect(command("unit-b", "cool").transition).toBe("system.mode-refused");
    expect(unit("unit-b").mode).not.toBe("cool");
  });

  it("heat recovery: every unit picks its own mode", () => {
    const { command, unit, outdoor } = multiSplit({ modeAuthority: "heat-recovery" });
    command("unit-a", "heat");
    expect(command("unit-b", "cool").transition).toBe("unit.command-applied");
    expect(unit("unit-a").mode).toBe("heat");
    expect(unit("unit-b").mode).toBe("cool");
    expect(outdoor().authority).toBeNull();
  });

  it("refuses leader without a leader unit, naming the field", () => {
    const parsed = outdoorUnitType.parameters.safeParse({ modeAuthority: "leader" });
    expect(parsed.success ? [] : parsed.error.issues[0]!.path).toEqual(["leaderUnit"]);
  });
});
