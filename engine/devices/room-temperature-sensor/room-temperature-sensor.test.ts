import { describe, expect, it } from "vitest";
import { DeviceHarness } from "../../../test/harness/device-harness";
import { roomTemperatureSensorParametersSchema } from "./parameters";
import {
  profileValueC,
  ROOM_TEMPERATURE_OBJECT,
  roomTemperatureSensorType,
} from "./room-temperature-sensor";

const S = 1_000_000;

function sensor(parameters: Record<string, unknown>) {
  const h = new DeviceHarness([{ id: "rts", type: roomTemperatureSensorType, parameters }]).start();
  const sent = () =>
    h.sentFrom("rts", ROOM_TEMPERATURE_OBJECT).map((t) => [Math.round(t.timeUs / S), t.value]);
  return { h, sent };
}

describe("room temperature sensor", () => {
  it("sends cyclically on DPT 9.001 when the room does not change", () => {
    const { h, sent } = sensor({ sending: { mode: "cyclic", cycleS: 120 } });
    expect(
      roomTemperatureSensorType.groupObjects(roomTemperatureSensorParametersSchema.parse({}))[0]
        ?.dpt,
    ).toBe("9.001");
    h.advance(400 * S);
    expect(sent()).toEqual([
      [120, 21],
      [240, 21],
      [360, 21],
    ]);
  });

  it("follows a profile and sends on change by 0.1 K at least 30 s apart", () => {
    // Common practice, no published source: 0.1 K, 30 s.
    const profile = [
      { atS: 0, valueC: 20 },
      { atS: 100, valueC: 21 },
    ];
    const { h, sent } = sensor({ source: "profile", profile, sending: { mode: "on-change" } });
    h.advance(200 * S);
    // A held change goes out when the interval ends, with the latest measurement (taken every 10 s) before that moment.
    expect(sent()).toEqual([
      [0, 20],
      [30, 20.2],
      [60, 20.5],
      [90, 20.8],
      [120, 21],
    ]);
  });

  it("follows the room model: Newton's law of cooling toward the outdoor temperature", () => {
    // Newton's law of cooling, any heat-transfer handbook: after τ the gap is 1/e.
    const { h } = sensor({
      initialC: 25,
      outdoorC: 15,
      timeConstantS: 600,
      sending: { mode: "off" },
    });
    h.advance(600 * S);
    expect(h.objectValue("rts", ROOM_TEMPERATURE_OBJECT)).toBeCloseTo(15 + 10 * Math.exp(-1), 2);
  });

  it('takes a value from input "temperature" and sends it', () => {
    const { h, sent } = sensor({ sending: { mode: "on-change" } });
    h.advance(60 * S);
    expect(h.dispatch("rts", { kind: "input", input: "temperature", value: 23.5 }).transition).toBe(
      "temperature.sent",
    );
    expect(sent().at(-1)).toEqual([60, 23.5]);
  });

  it("sends invalid data while its element is open", () => {
    // DPT spec §3.10: 0x7FFF invalid data.
    const { h, sent } = sensor({});
    h.dispatch("rts", { kind: "fault.inject", fault: "sensor.open" });
    expect(sent().at(-1)).toEqual([0, { invalid: true }]);
  });

  it("interpolates, holds and repeats profiles", () => {
    const p = roomTemperatureSensorParametersSchema.parse({
      source: "profile",
      profile: [
        { atS: 10, valueC: 18 },
        { atS: 20, valueC: 22 },
      ],
      profileRepeatS: 30,
    });
    expect([
      profileValueC(p, 0),
      profileValueC(p, 15),
      profileValueC(p, 25),
      profileValueC(p, 45),
    ]).toEqual([18, 20, 22, 20]);
  });

  it("refuses a profile source without points and points out of order, naming the field", () => {
    expect(
      roomTemperatureSensorParametersSchema.safeParse({ source: "profile" }).error?.issues[0],
    ).toMatchObject({ path: ["profile"] });
    const unordered = roomTemperatureSensorParametersSchema.safeParse({
      profile: [
        { atS: 10, valueC: 1 },
        { atS: 5, valueC: 2 },
      ],
    });
    expect(unordered.error?.issues[0]?.message).toBe(
      "profile points must be in time order: 5 s follows 10 s",
    );
  });
});
