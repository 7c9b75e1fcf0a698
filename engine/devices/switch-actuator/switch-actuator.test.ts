import { describe, expect, it } from "vitest";
import type { DeviceContext } from "../device-type";
import {
  switchActuatorParametersSchema,
  switchActuatorType,
  type SwitchActuatorParameters,
} from "./switch-actuator";

function context(parameters: SwitchActuatorParameters): DeviceContext<SwitchActuatorParameters> {
  return {
    nowUs: 0,
    deviceId: "act-1",
    individualAddress: 0x1102,
    parameters,
    links: [],
    objectValue: () => undefined,
    random: () => 0,
    roomTemperatureC: () => undefined,
    roomOutdoorC: () => undefined,
  };
}

describe("switch actuator", () => {
  const parameters = switchActuatorParametersSchema.parse({ channels: 2 });

  it("pairs each switch object with a status object, or drops the status when off", () => {
    expect(switchActuatorType.groupObjects(parameters).map((o) => `${o.number}:${o.name}`)).toEqual(
      ["0:Switch 1", "1:Status 1", "2:Switch 2", "3:Status 2"],
    );
    const quiet = switchActuatorParametersSchema.parse({ channels: 2, statusObjects: false });
    expect(switchActuatorType.groupObjects(quiet).map((o) => o.number)).toEqual([0, 2]);
  });

  it("switches the relay on a write and reports the change on its status object", () => {
    const state = switchActuatorType.initialState(parameters);
    const result = switchActuatorType.transition(
      state,
      { kind: "group.write", object: 2, value: true, source: 0x1101 },
      context(parameters),
    );
    expect(result.state.on).toEqual([false, true]);
    expect(result.effects).toEqual([
      { kind: "group.send", object: 3, service: "write", value: true },
    ]);
    expect(result.transition).toBe("relay.switched.on");
  });

  it("stays quiet when a write repeats the current position", () => {
    const state = switchActuatorType.initialState(parameters);
    const result = switchActuatorType.transition(
      state,
      { kind: "group.write", object: 0, value: false, source: 0x1101 },
      context(parameters),
    );
    expect(result.effects).toEqual([]);
    expect(result.transition).toBeUndefined();
  });

  it("turns off again when the staircase time runs out", () => {
    const staircase = switchActuatorParametersSchema.parse({ staircaseS: 30 });
    const on = switchActuatorType.transition(
      switchActuatorType.initialState(staircase),
      { kind: "group.write", object: 0, value: true, source: 1 },
      context(staircase),
    );
    expect(on.effects).toContainEqual({
      kind: "timer.set",
      name: "staircase-1",
      delayUs: 30_000_000,
    });
    const off = switchActuatorType.transition(
      on.state,
      { kind: "timer", name: "staircase-1" },
      context(staircase),
    );
    expect(off.state.on).toEqual([false]);
    expect(off.transition).toBe("staircase.expired.off");
  });

  it("toggles a channel from its manual button", () => {
    const result = switchActuatorType.transition(
      switchActuatorType.initialState(parameters),
      { kind: "button", button: "channel-1", action: "press" },
      context(parameters),
    );
    expect(result.state.on).toEqual([true, false]);
  });

  it("gives status objects the relay position at start so reads have an answer", () => {
    const result = switchActuatorType.transition(
      switchActuatorType.initialState(parameters),
      { kind: "start" },
      context(parameters),
    );
    expect(result.effects).toEqual([
      { kind: "object.store", object: 1, value: false },
      { kind: "object.store", object: 3, value: false },
    ]);
  });
});
