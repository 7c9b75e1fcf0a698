import { describe, expect, it } from "vitest";
import { DeviceHarness, HARNESS_LINK_DELAY_US } from "../../../test/harness/device-harness";
import { dpt20105FromMode } from "../hvac/hvac-mode";
import {
  CONTROLLER_ANNOUNCE_PERIOD_US,
  LINK_SUPERVISION_GRACE_US,
} from "../hvac/unit-link-messages";
import { indoorUnitType } from "../indoor-unit/indoor-unit";
import type { IndoorUnitState } from "../indoor-unit/state";
import { outdoorUnitType } from "../outdoor-unit/outdoor-unit";
import { gatewayFixture } from "./gateway-fixture";
import { hvacGatewayType } from "./hvac-gateway";
import { gatewayObjects as O } from "./objects";

const S = 1_000_000;

describe("hvac gateway on the unit link", () => {
  it("reports two primaries on its fault objects, stops commands, and clears when the controller is made secondary", () => {
    // Common practice, no published source: one primary per indoor unit.
    const f = gatewayFixture({ wallController: { role: "primary" } });
    expect(f.gateway().faults).toContain("link.two-primaries");
    expect(f.lastSent(O.fault)).toBe(true);
    // DPT spec §3 (16.000): at most 14 ASCII characters.
    expect(f.lastSent(O.faultText)).toBe("two primaries");
    expect(f.harness.faults.get("gw")?.has("link.two-primaries")).toBe(true);

    expect(f.write(O.power, true).transition).toBe("power.switched");
    expect(f.unit().power).toBe(false);
    expect(f.harness.transitionNames("gw")).toContain("link.command-refused");

    f.harness.setParameter("wc", "role", "secondary");
    f.harness.advance(CONTROLLER_ANNOUNCE_PERIOD_US);
    f.settle();
    expect(f.lastSent(O.fault)).toBe(false);
    expect(f.lastSent(O.faultText)).toBe("");
    f.write(O.power, true);
    expect(f.unit().power).toBe(true);
  });

  it("counts itself as a controller: a secondary gateway alone gives link.no-primary", () => {
    // Common practice, no published source: no primary = lost communication.
    const f = gatewayFixture({ gateway: { role: "secondary" } });
    f.harness.advance(LINK_SUPERVISION_GRACE_US);
    expect(f.gateway().faults).toContain("link.no-primary");
    expect(f.lastSent(O.faultText)).toBe("no primary");
  });

  it("sends status telegrams for changes made at the wall controller", () => {
    const f = gatewayFixture({
      wallController: { role: "secondary" },
      unit: { initialSetpointC: 21 },
    });
    f.press("power");
    expect(f.sent(O.powerStatus)).toEqual([true]);
    f.press("setpoint-up");
    expect(f.lastSent(O.setpointStatus)).toBe(21.5);
    f.press("mode");
    expect(f.lastSent(O.modeStatus)).toBe(dpt20105FromMode(f.unit().mode));
  });

  it("forwards an external room temperature as primary and reports it as the room temperature", () => {
    const f = gatewayFixture({
      gateway: { roomTemperatureSource: "external" },
      unit: { initialRoomC: 20 },
    });
    expect(f.write(O.externalRoomTemperature, 23.4).transition).toBe("room.external-updated");
    expect(f.unit().externalRoomC).toBe(23.4);
    // The first report went out at start; the change waits out the 30 s minimum interval.
    f.harness.advance(30 * S);
    expect(f.lastSent(O.roomTemperature)).toBe(23.4);
  });

  it("refuses an external room temperature as secondary", () => {
    // Common practice, no published source: only the primary may supply the room temperature.
    const f = gatewayFixture({
      gateway: { roomTemperatureSource: "external", role: "secondary" },
      wallController: { role: "primary" },
    });
    expect(f.write(O.externalRoomTemperature, 23.4).transition).toBe("room.external-refused");
    expect(f.unit().externalRoomC).toBeNull();
  });

  it("reports an open unit sensor as a fault and the room temperature as invalid data", () => {
    const f = gatewayFixture();
    f.harness.dispatch("unit", { kind: "fault.inject", fault: "unit.sensor-open" });
    f.settle();
    expect(f.lastSent(O.fault)).toBe(true);
    expect(f.lastSent(O.faultText)).toBe("sensor open");
    // DPT spec §3.10: 0x7FFF means invalid data.
    expect(f.lastSent(O.roomTemperature)).toEqual({ invalid: true });
  });

  it("sends the room temperature on change by 0.1 K, at least 30 s apart", () => {
    // Common practice, no published source: 0.1 K delta, 30 s minimum interval.
    const f = gatewayFixture({ unit: { initialRoomC: 26, outdoorC: 6, timeConstantS: 600 } });
    f.harness.advance(600 * S);
    const times = f.harness.sentFrom("gw", O.roomTemperature).map((t) => t.timeUs);
    expect(times.length).toBeGreaterThan(5);
    for (let i = 1; i < times.length; i++)
      expect((times[i] ?? 0) - (times[i - 1] ?? 0)).toBeGreaterThanOrEqual(30 * S);
  });

  it("sends the room temperature cyclically when asked", () => {
    const f = gatewayFixture({
      gateway: { roomTemperatureSending: { mode: "cyclic", cycleS: 60 } },
      unit: { initialRoomC: 21, outdoorC: 21 },
    });
    f.harness.advance(300 * S);
    expect(
      f.harness.sentFrom("gw", O.roomTemperature).map((t) => Math.round(t.timeUs / S)),
    ).toEqual([60, 120, 180, 240, 300]);
  });

  it("sends no room temperature with sending off, but the object answers reads", () => {
    const f = gatewayFixture({
      gateway: { roomTemperatureSending: { mode: "off" } },
      unit: { initialRoomC: 19.5 },
    });
    f.harness.advance(120 * S);
    expect(f.sent(O.roomTemperature)).toEqual([]);
    expect(typeof f.harness.objectValue("gw", O.roomTemperature)).toBe("number");
  });
});

describe("hvac gateways on a multi-split system", () => {
  function multiSplit() {
    const gateway = { systemType: "multi-split" };
    const harness = new DeviceHarness(
      [
        { id: "outdoor", type: outdoorUnitType },
        { id: "gw-a", type: hvacGatewayType, parameters: gateway },
        { id: "gw-b", type: hvacGatewayType, parameters: gateway },
        { id: "unit-a", type: indoorUnitType },
        { id: "unit-b", type: indoorUnitType },
      ],
      [
        { id: "link-a", members: ["gw-a", "unit-a"] },
        { id: "link-b", members: ["gw-b", "unit-b"] },
        { id: "system", members: ["outdoor", "unit-a", "unit-b"] },
      ],
    ).start();
    const write = (gw: string, object: number, value: unknown) => {
      const result = harness.write(gw, object, value);
      harness.advance(20 * HARNESS_LINK_DELAY_US);
      return result;
    };
    return {
      harness,
      write,
      unit: (id: string) => harness.state<IndoorUnitState>(id),
      last: (gw: string, object: number) => harness.sentFrom(gw, object).at(-1)?.value,
    };
  }

  it("refuses cool on a member while the authority heats; the mode status reports what it runs", () => {
    // Common practice, no published source: while the system heats, others may heat or fan.
    const { harness, write, unit, last } = multiSplit();
    write("gw-a", O.power, true);
    write("gw-a", O.mode, 1);
    write("gw-b", O.power, true);
    write("gw-b", O.mode, 3);
    expect(harness.transitionNames("gw-b")).toContain("system.mode-refused");
    expect(["heat", "fan"]).toContain(unit("unit-b").mode);
    expect(last("gw-b", O.modeStatus)).toBe(dpt20105FromMode(unit("unit-b").mode));
    expect(last("gw-a", O.modeAuthority)).toBe(true);
    expect(harness.objectValue("gw-b", O.modeAuthority)).toBe(false);
  });

  it("lets members cool, fan or dry while the authority cools", () => {
    // Common practice, no published source.
    const { write, unit, last } = multiSplit();
    write("gw-a", O.power, true);
    write("gw-a", O.mode, 3);
    write("gw-b", O.power, true);
    for (const [code, mode] of [
      [3, "cool"],
      [9, "fan"],
      [14, "dry"],
    ] as const) {
      write("gw-b", O.mode, code);
      expect(unit("unit-b").mode).toBe(mode);
      expect(last("gw-b", O.modeStatus)).toBe(code);
    }
  });
});
