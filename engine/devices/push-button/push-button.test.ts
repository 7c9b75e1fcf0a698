import { describe, expect, it } from "vitest";
import type { DeviceContext } from "../device-type";
import {
  pushButtonParametersSchema,
  pushButtonType,
  type PushButtonParameters,
} from "./push-button";

function context(
  parameters: PushButtonParameters,
  values: Record<number, unknown> = {},
): DeviceContext<PushButtonParameters> {
  return {
    nowUs: 0,
    deviceId: "pb-1",
    individualAddress: 0x1101,
    parameters,
    links: [],
    objectValue: (object) => values[object],
    random: () => 0.5,
    roomTemperatureC: () => undefined,
    roomOutdoorC: () => undefined,
  };
}

describe("push-button", () => {
  const parameters = pushButtonParametersSchema.parse({
    channels: [
      { function: "toggle" },
      { function: "value", percent: 50 },
      { function: "scene", scene: 12 },
      { function: "off" },
    ],
  });

  it("declares one object per rocker with the DPT of its function", () => {
    const objects = pushButtonType.groupObjects(parameters);
    // DPT spec §4 (1.001 switch), §3.4 (5.001 scaling), 17.001 scene number.
    expect(objects.map((o) => [o.number, o.dpt])).toEqual([
      [0, "1.001"],
      [1, "5.001"],
      [2, "17.001"],
      [3, "1.001"],
    ]);
    // A toggle must hear the status it toggles: write and update flags on.
    expect(objects[0]!.flags).toMatchObject({
      communication: true,
      write: true,
      transmit: true,
      update: true,
    });
    expect(objects[1]!.flags).toMatchObject({ transmit: true, write: false });
  });

  it("defaults to one toggle rocker", () => {
    const defaults = pushButtonParametersSchema.parse({});
    expect(pushButtonType.groupObjects(defaults)).toHaveLength(1);
    expect(pushButtonType.buttons(defaults)).toEqual([{ id: "channel-1", label: "Rocker 1" }]);
  });

  it("toggles from the object's current value", () => {
    const state = pushButtonType.initialState(parameters);
    const off = pushButtonType.transition(
      state,
      { kind: "button", button: "channel-1", action: "press" },
      context(parameters, { 0: false }),
    );
    expect(off.effects).toEqual([{ kind: "group.send", object: 0, service: "write", value: true }]);
    const on = pushButtonType.transition(
      off.state,
      { kind: "button", button: "channel-1", action: "press" },
      context(parameters, { 0: true }),
    );
    expect(on.effects).toEqual([{ kind: "group.send", object: 0, service: "write", value: false }]);
    expect(on.state.presses).toEqual([2, 0, 0, 0]);
  });

  it("sends the configured value, scene and fixed state", () => {
    const state = pushButtonType.initialState(parameters);
    const press = (button: string) =>
      pushButtonType.transition(
        state,
        { kind: "button", button, action: "press" },
        context(parameters),
      ).effects;
    expect(press("channel-2")).toEqual([
      { kind: "group.send", object: 1, service: "write", value: 50 },
    ]);
    expect(press("channel-3")).toEqual([
      { kind: "group.send", object: 2, service: "write", value: 12 },
    ]);
    expect(press("channel-4")).toEqual([
      { kind: "group.send", object: 3, service: "write", value: false },
    ]);
  });

  it("ignores releases and notes an unknown rocker", () => {
    const state = pushButtonType.initialState(parameters);
    expect(
      pushButtonType.transition(
        state,
        { kind: "button", button: "channel-1", action: "release" },
        context(parameters),
      ).effects,
    ).toEqual([]);
    expect(
      pushButtonType.transition(
        state,
        { kind: "button", button: "channel-9", action: "press" },
        context(parameters),
      ).effects[0],
    ).toMatchObject({ kind: "note" });
  });

  it("refuses a scene outside 1..64 (DPT spec 17.001 carries scenes 1..64 as 0..63)", () => {
    expect(
      pushButtonParametersSchema.safeParse({ channels: [{ function: "scene", scene: 65 }] })
        .success,
    ).toBe(false);
  });
});
