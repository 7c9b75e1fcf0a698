import { describe, expect, it } from "vitest";
import { DeviceHarness } from "../../../test/harness/device-harness";
import { LINK_SUPERVISION_GRACE_US, type UnitStatus } from "../hvac/unit-link-messages";
import { indoorUnitType } from "./indoor-unit";
import type { IndoorUnitState } from "./state";

const S = 1_000_000;

/** An indoor unit alone on link "l1"; controllers are played by hand through link.receive events. */
function unitAlone(parameters: Record<string, unknown> = {}) {
  const harness = new DeviceHarness(
    [{ id: "unit", type: indoorUnitType, parameters }],
    [{ id: "l1", members: ["unit", "gw", "wc"] }],
  );
  harness.start();
  const say = (from: string, message: unknown) =>
    harness.dispatch("unit", { kind: "link.receive", link: "l1", from, message });
  const announce = (from: string, role: "primary" | "secondary") =>
    say(from, { kind: "controller.announce", role, controller: "gateway" });
  return { harness, say, announce, state: () => harness.state<IndoorUnitState>("unit") };
}

function lastStatus(result: { effects: readonly { kind: string }[] }): UnitStatus | undefined {
  const sends = result.effects.filter((effect) => effect.kind === "link.send") as unknown as {
    message: UnitStatus;
  }[];
  return sends.at(-1)?.message;
}

describe("indoor unit thermal model", () => {
  it("with the unit off follows T(t) = Ta + (T0 − Ta)·exp(−t/τ) within 0.01 K", () => {
    // Newton's law of cooling, any heat-transfer handbook.
    const T0 = 24;
    const Ta = 8;
    const tauS = 1800;
    const { harness, state } = unitAlone({
      initialRoomC: T0,
      outdoorC: Ta,
      timeConstantS: tauS,
      modelStepS: 10,
    });
    for (let minute = 1; minute <= 180; minute++) {
      harness.runUntil(minute * 60 * S);
      const analytic = Ta + (T0 - Ta) * Math.exp((-minute * 60) / tauS);
      expect(Math.abs(state().roomC - analytic)).toBeLessThan(0.01);
    }
  });

  it("heats toward the setpoint, then cycles the compressor inside the band", () => {
    // Lumped-capacitance room (engine/room/lumped-room.ts) heated by the unit's supply air;
    // on/off hysteresis of 1 K around the setpoint (common practice, no published source).
    const { harness, state, say, announce } = unitAlone({ initialRoomC: 18, outdoorC: 5 });
    announce("gw", "primary");
    say("gw", { kind: "unit.command", power: true, mode: "heat", setpointC: 22 });
    harness.runUntil(10 * 60 * S);
    expect(state().roomC).toBeGreaterThan(19);
    expect(state().output).toBe("heating");
    let lowest = Infinity;
    let highest = -Infinity;
    for (let minute = 60; minute <= 240; minute++) {
      harness.runUntil(minute * 60 * S);
      lowest = Math.min(lowest, state().roomC);
      highest = Math.max(highest, state().roomC);
    }
    // The unit reads the room every 10 s, so it can pass an edge by one step's change
    // (under 0.05 K in this room).
    expect(lowest).toBeGreaterThan(21.5 - 0.05);
    expect(highest).toBeLessThan(22.5 + 0.05);
    const names = harness.transitionNames("unit");
    expect(names.filter((n) => n === "compressor.off").length).toBeGreaterThan(1);
    expect(names.filter((n) => n === "compressor.heating").length).toBeGreaterThan(1);
  });

  it("in a shared room, auto starts in the direction that room needs, whatever its own-room parameters say", () => {
    // Auto mode heats below and cools above the setpoint (common practice, no published source).
    const harness = new DeviceHarness(
      [
        {
          id: "unit",
          type: indoorUnitType,
          room: "warm",
          parameters: {
            initialRoomC: 18,
            initialPower: true,
            initialMode: "auto",
            initialSetpointC: 21,
          },
        },
      ],
      [],
      [
        {
          id: "warm",
          spec: { initialC: 28, outdoorC: 30, heatCapacityJPerK: 600_000, envelopeUaWPerK: 50 },
        },
      ],
    );
    harness.start();
    const state = harness.state<IndoorUnitState>("unit");
    expect(state.roomC).toBe(28);
    expect(state.output).toBe("cooling");
  });

  it("in fan mode drifts like an idle room", () => {
    const { harness, state, say, announce } = unitAlone({
      initialRoomC: 25,
      outdoorC: 15,
      timeConstantS: 1200,
    });
    announce("gw", "primary");
    say("gw", { kind: "unit.command", power: true, mode: "fan" });
    harness.runUntil(1200 * S);
    // Newton's law of cooling: after one time constant the gap shrinks to 1/e.
    expect(state().roomC).toBeCloseTo(15 + 10 * Math.exp(-1), 2);
  });
});

describe("indoor unit controller roles", () => {
  it("two primaries raise link.two-primaries and stop commands until one is secondary", () => {
    // Common practice, no published source: one primary controller per indoor unit.
    const { harness, state, say, announce } = unitAlone();
    announce("gw", "primary");
    const conflict = announce("wc", "primary");
    expect(conflict.transition).toBe("link.two-primaries");
    expect(harness.faults.get("unit")?.has("link.two-primaries")).toBe(true);
    expect(lastStatus(conflict)?.faults).toContain("link.two-primaries");

    const refused = say("gw", { kind: "unit.command", power: true });
    expect(refused.transition).toBe("link.command-refused");
    expect(state().power).toBe(false);

    const cleared = announce("wc", "secondary");
    expect(cleared.transition).toBe("link.fault-cleared");
    expect(harness.faults.get("unit")?.size).toBe(0);
    // Applied: power on in auto with the room (20 °C) below the band around 21 °C starts heating.
    expect(say("wc", { kind: "unit.command", power: true }).transition).toBe("compressor.heating");
    expect(state().power).toBe(true);
  });

  it("with no primary after the start-up grace reports link.no-primary (lost communication)", () => {
    // Common practice, no published source.
    const { harness, announce } = unitAlone();
    announce("wc", "secondary");
    harness.advance(LINK_SUPERVISION_GRACE_US);
    expect(harness.transitionNames("unit")).toContain("link.no-primary");
    expect(harness.faults.get("unit")?.has("link.no-primary")).toBe(true);
    announce("gw", "primary");
    expect(harness.faults.get("unit")?.has("link.no-primary")).toBe(false);
  });

  it("forgets a controller that stopped announcing", () => {
    const { harness, announce } = unitAlone();
    announce("gw", "primary");
    harness.advance(60 * S);
    expect(harness.faults.get("unit")?.has("link.no-primary")).toBe(true);
  });

  it("takes an external room temperature only from the primary", () => {
    // Common practice, no published source: only the primary may supply the room temperature.
    const { state, say, announce } = unitAlone({ initialRoomC: 20 });
    announce("gw", "primary");
    announce("wc", "secondary");
    expect(say("wc", { kind: "unit.command", externalRoomC: 23.5 }).transition).toBe(
      "room.external-refused",
    );
    expect(state().externalRoomC).toBeNull();
    const accepted = say("gw", { kind: "unit.command", externalRoomC: 23.5 });
    expect(lastStatus(accepted)?.roomC).toBe(23.5);
  });

  it("stops with unit.sensor-open and refuses power on until the sensor is restored", () => {
    const { harness, state, say, announce } = unitAlone({ initialPower: true });
    announce("gw", "primary");
    const opened = harness.dispatch("unit", { kind: "fault.inject", fault: "unit.sensor-open" });
    expect(opened.transition).toBe("unit.sensor-open");
    expect(state().power).toBe(false);
    expect(lastStatus(opened)?.roomC).toBeNull();
    expect(say("gw", { kind: "unit.command", power: true }).transition).toBe("unit.sensor-open");
    harness.dispatch("unit", { kind: "fault.clear", fault: "unit.sensor-open" });
    say("gw", { kind: "unit.command", power: true });
    expect(state().power).toBe(true);
  });

  it("ignores messages that are not unit-link messages", () => {
    const { say } = unitAlone();
    expect(say("gw", { kind: "something.else" }).effects).toEqual([]);
  });
});
