import { describe, expect, it } from "vitest";
import { hvacGatewayType } from "./hvac-gateway";
import { gatewayFixture } from "./gateway-fixture";
import { gatewayObjects as O } from "./objects";
import { hvacGatewayParametersSchema } from "./parameters";

const numbers = (parameters: unknown) =>
  hvacGatewayType.groupObjects(hvacGatewayParametersSchema.parse(parameters)).map((o) => o.number);

describe("hvac gateway parameters and objects", () => {
  it("parses {} to a valid default: primary, single split, full mode, 3 fan levels with auto", () => {
    const p = hvacGatewayParametersSchema.parse({});
    expect(p).toMatchObject({
      role: "primary",
      systemType: "single-split",
      modeControl: "full",
      fanLevels: 3,
      fanAuto: true,
      setpointMinC: 16,
      setpointMaxC: 30,
    });
    // Common practice, no published source: 0.1 K delta, 30 s minimum interval.
    expect(p.roomTemperatureSending).toEqual({
      mode: "on-change",
      deltaK: 0.1,
      minIntervalS: 30,
      cycleS: 600,
    });
    expect(numbers({})).toEqual([
      O.power,
      O.powerStatus,
      O.setpoint,
      O.setpointStatus,
      O.mode,
      O.modeStatus,
      O.fan,
      O.fanStatus,
      O.roomTemperature,
      O.fault,
      O.faultText,
    ]);
  });

  it("has objects only for enabled functions", () => {
    const all = numbers({
      modeControl: "simplified",
      louvre: true,
      roomTemperatureSource: "external",
      scenes: [{ scene: 3 }],
      windowContact: true,
      lock: true,
      systemType: "multi-split",
    });
    expect(all).toEqual(
      expect.arrayContaining([
        O.heatCool,
        O.heatCoolStatus,
        O.louvre,
        O.louvreStatus,
        O.externalRoomTemperature,
        O.scene,
        O.sceneControl,
        O.windowContact,
        O.lock,
        O.modeAuthority,
      ]),
    );
    expect(all).not.toContain(O.mode);
    expect(numbers({})).not.toContain(O.modeAuthority);
  });

  it("uses the DPTs of the KNX standard for each object", () => {
    const objects = hvacGatewayType.groupObjects(
      hvacGatewayParametersSchema.parse({
        modeControl: "simplified",
        louvre: true,
        scenes: [{ scene: 1 }],
        windowContact: true,
        systemType: "multi-split",
      }),
    );
    const dpt = (n: number) => objects.find((o) => o.number === n)?.dpt;
    // DPT spec §4.2 heat/cool 1.100; §3 5.001 scaling, 17.001 scene number, 18.001 scene control, 16.000 text, 1.005 alarm.
    expect([
      dpt(O.heatCool),
      dpt(O.fan),
      dpt(O.louvre),
      dpt(O.scene),
      dpt(O.sceneControl),
      dpt(O.faultText),
      dpt(O.fault),
    ]).toEqual(["1.100", "5.100", "5.001", "17.001", "18.001", "16.000", "1.005"]);
    // DPT 1.019 window/door (0 closed, 1 open) — recalled from memory of the DPT spec.
    expect(dpt(O.windowContact)).toBe("1.019");
  });

  it("refuses inverted setpoint limits with a clear message", () => {
    const parsed = hvacGatewayParametersSchema.safeParse({ setpointMinC: 26, setpointMaxC: 20 });
    expect(parsed.error?.issues[0]).toMatchObject({
      path: ["setpointMinC"],
      message: "setpointMinC (26 °C) must be below setpointMaxC (20 °C)",
    });
  });

  it("refuses scene numbers outside 1..64, twice-used scenes and fan levels out of reach", () => {
    // DPT spec §3 (17.001): scenes 1..64 as people count them.
    expect(
      hvacGatewayParametersSchema.safeParse({ scenes: [{ scene: 65 }] }).error?.issues[0]?.message,
    ).toBe("scene must be 1..64 (DPT 17.001)");
    expect(
      hvacGatewayParametersSchema.safeParse({ scenes: [{ scene: 2 }, { scene: 2 }] }).error
        ?.issues[0]?.message,
    ).toBe("scene 2 has two slots");
    expect(
      hvacGatewayParametersSchema.safeParse({ fanLevels: 2, scenes: [{ scene: 1, fanLevel: 4 }] })
        .success,
    ).toBe(false);
    expect(hvacGatewayParametersSchema.safeParse({ fanLevels: 6 }).error?.issues[0]?.message).toBe(
      "fanLevels must be 2..5",
    );
  });
});

describe("hvac gateway commands", () => {
  it("simplified mode: 0 selects cooling and 1 heating, with matching status", () => {
    // DPT spec §4.2 (1.100): 0 = cooling, 1 = heating.
    const f = gatewayFixture({ gateway: { modeControl: "simplified" } });
    f.write(O.heatCool, false);
    expect(f.unit().mode).toBe("cool");
    expect(f.lastSent(O.heatCoolStatus)).toBe(false);
    f.write(O.heatCool, true);
    expect(f.unit().mode).toBe("heat");
    expect(f.lastSent(O.heatCoolStatus)).toBe(true);
  });

  it.each([
    [0, "auto"],
    [1, "heat"],
    [3, "cool"],
    [9, "fan"],
    [14, "dry"],
  ] as const)(
    "full mode: DPT 20.105 code %i runs %s and the status echoes the code",
    (code, mode) => {
      // DPT spec §4 (20.105): 0 auto, 1 heat, 3 cool, 9 fan only, 14 dehumidification.
      const f = gatewayFixture({ unit: { initialMode: code === 1 ? "cool" : "heat" } });
      expect(f.write(O.mode, code).transition).toBe("mode.selected");
      expect(f.unit().mode).toBe(mode);
      expect(f.lastSent(O.modeStatus)).toBe(code);
    },
  );

  it.each([2, 6, 7, 20])(
    "full mode: DPT 20.105 code %i is refused with mode.refused and the status re-sent",
    (code) => {
      // DPT spec §4 (20.105): 2 morning warmup, 6 off, 7 test, 20 NoDem are not unit modes.
      const f = gatewayFixture({ unit: { initialMode: "cool" } });
      expect(f.write(O.mode, code).transition).toBe("mode.refused");
      expect(f.unit().mode).toBe("cool");
      expect(f.lastSent(O.modeStatus)).toBe(3);
    },
  );

  it("clamps setpoint writes to the limits and reports the clamped value", () => {
    // Common practice, no published source: clamp and report what the unit really uses.
    const f = gatewayFixture({ gateway: { setpointMinC: 18, setpointMaxC: 26 } });
    expect(f.write(O.setpoint, 31).transition).toBe("setpoint.clamped");
    expect(f.unit().setpointC).toBe(26);
    expect(f.lastSent(O.setpointStatus)).toBe(26);
    f.write(O.setpoint, 12);
    expect(f.lastSent(O.setpointStatus)).toBe(18);
    // The same clamped value again still gets its status, so the sender sees the limit.
    f.write(O.setpoint, 12);
    expect(f.sent(O.setpointStatus)).toEqual([26, 18, 18]);
    expect(f.write(O.setpoint, 22.5).transition).toBe("setpoint.accepted");
    expect(f.lastSent(O.setpointStatus)).toBe(22.5);
  });

  it("takes fan levels 1..fanLevels on DPT 5.100, 0 as auto when enabled, clamps above", () => {
    // Common practice, no published source: fan stage 0 = automatic.
    const f = gatewayFixture({ gateway: { fanLevels: 4 } });
    f.write(O.fan, 2);
    expect(f.unit().fanLevel).toBe(2);
    expect(f.lastSent(O.fanStatus)).toBe(2);
    expect(f.write(O.fan, 9).transition).toBe("fan.clamped");
    expect(f.lastSent(O.fanStatus)).toBe(4);
    f.write(O.fan, 0);
    expect(f.unit().fanLevel).toBe(0);
    const noAuto = gatewayFixture({ gateway: { fanAuto: false }, unit: { initialFanLevel: 1 } });
    expect(noAuto.write(O.fan, 0).transition).toBe("fan.refused");
    expect(noAuto.unit().fanLevel).toBe(1);
  });

  it("positions the louvre (DPT 5.001) when enabled", () => {
    const f = gatewayFixture({ gateway: { louvre: true } });
    f.write(O.louvre, 75);
    expect(f.unit().louvrePercent).toBe(75);
    expect(f.lastSent(O.louvreStatus)).toBe(75);
  });

  it("switches the unit with status, and fills the status objects silently on the first report", () => {
    const f = gatewayFixture();
    expect(f.harness.sent.filter((t) => t.object !== O.roomTemperature)).toEqual([]);
    expect(f.harness.objectValue("gw", O.powerStatus)).toBe(false);
    f.write(O.power, true);
    expect(f.unit().power).toBe(true);
    expect(f.sent(O.powerStatus)).toEqual([true]);
  });
});

describe("hvac gateway scenes", () => {
  const scenes = [{ scene: 5, power: true, mode: "cool", fanLevel: 3, setpointC: 24 }];

  it("recalls a slot by DPT 17.001", () => {
    const f = gatewayFixture({ gateway: { scenes } });
    expect(f.write(O.scene, 5).transition).toBe("scene.recalled");
    expect(f.unit()).toMatchObject({ power: true, mode: "cool", fanLevel: 3, setpointC: 24 });
    expect(f.lastSent(O.setpointStatus)).toBe(24);
  });

  it("learns the current state by DPT 18.001 and a later recall restores it", () => {
    // DPT spec §3 (18.001): bit 7 learn; scene 1..64.
    const f = gatewayFixture({ gateway: { scenes } });
    f.write(O.power, true);
    f.write(O.mode, 1);
    f.write(O.fan, 2);
    f.write(O.setpoint, 22.5);
    expect(f.write(O.sceneControl, { learn: true, scene: 5 }).transition).toBe("scene.learned");
    f.write(O.power, false);
    f.write(O.mode, 3);
    f.write(O.setpoint, 19);
    f.write(O.sceneControl, { learn: false, scene: 5 });
    expect(f.unit()).toMatchObject({ power: true, mode: "heat", fanLevel: 2, setpointC: 22.5 });
    f.write(O.power, false);
    f.write(O.scene, 5);
    expect(f.unit()).toMatchObject({ power: true, mode: "heat", fanLevel: 2, setpointC: 22.5 });
  });

  it("ignores scenes without a slot with scene.unknown", () => {
    const f = gatewayFixture({ gateway: { scenes } });
    expect(f.write(O.scene, 6).transition).toBe("scene.unknown");
    expect(f.write(O.sceneControl, { learn: true, scene: 6 }).transition).toBe("scene.unknown");
  });
});

describe("hvac gateway window contact and lock", () => {
  it("stops the unit while the window is open and restores it when closed", () => {
    // Common practice, no published source. DPT 1.019: 1 = open (recalled from memory of the DPT spec).
    const f = gatewayFixture({ gateway: { windowContact: true } });
    f.write(O.power, true);
    expect(f.write(O.windowContact, true).transition).toBe("window.opened");
    expect(f.unit().power).toBe(false);
    expect(f.lastSent(O.powerStatus)).toBe(false);
    expect(f.write(O.windowContact, false).transition).toBe("window.closed");
    expect(f.unit().power).toBe(true);
    expect(f.lastSent(O.powerStatus)).toBe(true);
  });

  it("holds a power-on asked for while the window is open until it closes", () => {
    const f = gatewayFixture({ gateway: { windowContact: true } });
    f.write(O.windowContact, true);
    expect(f.write(O.power, true).transition).toBe("window.power-held");
    expect(f.unit().power).toBe(false);
    f.write(O.windowContact, false);
    expect(f.unit().power).toBe(true);
  });

  it("leaves a unit that was off switched off when the window closes", () => {
    const f = gatewayFixture({ gateway: { windowContact: true } });
    f.write(O.windowContact, true);
    f.write(O.windowContact, false);
    expect(f.unit().power).toBe(false);
  });

  it("refuses KNX commands while locked, with lock.command-refused", () => {
    const f = gatewayFixture({ gateway: { lock: true } });
    expect(f.write(O.lock, true).transition).toBe("lock.engaged");
    expect(f.write(O.power, true).transition).toBe("lock.command-refused");
    expect(f.write(O.setpoint, 25).transition).toBe("lock.command-refused");
    expect(f.unit().power).toBe(false);
    expect(f.lastSent(O.powerStatus)).toBe(false);
    f.write(O.lock, false);
    f.write(O.power, true);
    expect(f.unit().power).toBe(true);
  });
});
