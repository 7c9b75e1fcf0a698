import { describe, expect, it } from "vitest";
import { getDeviceType } from "../catalogue";
import type { DeviceContext } from "../device-type";
import "./index";
import {
  controlPanelParametersSchema,
  controlPanelType,
  type ControlPanelParameters,
} from "./control-panel";

function context(
  parameters: ControlPanelParameters,
  values: Record<number, unknown> = {},
): DeviceContext<ControlPanelParameters> {
  return {
    nowUs: 0,
    deviceId: "cp-1",
    individualAddress: 0x1140,
    parameters,
    links: [],
    objectValue: (object) => values[object],
    random: () => 0.5,
    roomTemperatureC: () => undefined,
    roomOutdoorC: () => undefined,
  };
}

const parameters = controlPanelParametersSchema.parse({
  tiles: [
    { label: "Power", dpt: "1.001", kind: "toggle" },
    { label: "Setpoint 21", dpt: "9.001", kind: "value", value: 21 },
    { label: "Cool", dpt: "20.105", kind: "value", value: 3 },
    { label: "Fan 2", dpt: "5.100", kind: "value", value: 2 },
    { label: "Heat/cool", dpt: "1.100", kind: "toggle" },
    { label: "Scene 5", dpt: "17.001", kind: "scene", value: 5 },
    { label: "Room", dpt: "9.001", kind: "status" },
    { label: "Blinds 40 %", dpt: "5.001", kind: "value", value: 40 },
  ],
});

const press = (button: string, values: Record<number, unknown> = {}) =>
  controlPanelType.transition(
    controlPanelType.initialState(parameters),
    { kind: "button", button, action: "press" },
    context(parameters, values),
  );

/** The first issue's path and message when the tiles do not parse. */
function refusal(tiles: unknown): { path: string; message: string } | undefined {
  const parsed = controlPanelParametersSchema.safeParse({ tiles });
  if (parsed.success) return undefined;
  const issue = parsed.error.issues[0]!;
  return { path: issue.path.join("."), message: issue.message };
}

describe("control-panel", () => {
  it("is in the catalogue", () => {
    expect(getDeviceType("control-panel")).toBe(controlPanelType);
  });

  it("defaults to one switching toggle tile", () => {
    const defaults = controlPanelParametersSchema.parse({});
    expect(defaults.tiles).toEqual([{ label: "Switch", dpt: "1.001", kind: "toggle" }]);
    expect(controlPanelType.buttons(defaults)).toEqual([{ id: "tile-1", label: "Switch" }]);
  });

  it("declares one object per tile with the tile's DPT; command tiles send, status tiles only listen", () => {
    const objects = controlPanelType.groupObjects(parameters);
    expect(objects.map((o) => [o.number, o.name, o.dpt, o.role])).toEqual([
      [0, "Power", "1.001", "command"],
      [1, "Setpoint 21", "9.001", "command"],
      [2, "Cool", "20.105", "command"],
      [3, "Fan 2", "5.100", "command"],
      [4, "Heat/cool", "1.100", "command"],
      [5, "Scene 5", "17.001", "command"],
      [6, "Room", "9.001", "input"],
      [7, "Blinds 40 %", "5.001", "command"],
    ]);
    // Transmit flag: the object may send on its first address; write/update: it takes
    // GroupValue_Write / GroupValue_Response from its other addresses (the status).
    expect(objects[1]!.flags).toEqual({
      communication: true,
      read: false,
      write: true,
      transmit: true,
      update: true,
      readOnInit: false,
    });
    expect(objects[6]!.flags).toEqual({
      communication: true,
      read: false,
      write: true,
      transmit: false,
      update: true,
      readOnInit: false,
    });
  });

  it("gives every command tile a button and none to status tiles", () => {
    expect(controlPanelType.buttons(parameters).map((b) => b.id)).toEqual([
      "tile-1",
      "tile-2",
      "tile-3",
      "tile-4",
      "tile-5",
      "tile-6",
      "tile-8",
    ]);
  });

  it("toggles from the value the tile last heard", () => {
    // DPT spec §4 1.001: 0 off, 1 on.
    const on = press("tile-1", { 0: false });
    expect(on.effects).toEqual([{ kind: "group.send", object: 0, service: "write", value: true }]);
    expect(on.transition).toBe("tile.toggled-on");
    const off = press("tile-1", { 0: true });
    expect(off.effects).toEqual([
      { kind: "group.send", object: 0, service: "write", value: false },
    ]);
    // Never heard anything yet: the first press switches on.
    expect(press("tile-1").effects[0]).toMatchObject({ value: true });
    // DPT spec §4.2 1.100: 0 = cooling, 1 = heating; from heating the toggle asks for cooling.
    expect(press("tile-5", { 4: true }).effects[0]).toMatchObject({ object: 4, value: false });
  });

  it("sends the stored preset of value and scene tiles", () => {
    expect(press("tile-2").effects).toEqual([
      { kind: "group.send", object: 1, service: "write", value: 21 },
    ]);
    // DPT spec 20.105: 3 = cool.
    expect(press("tile-3").effects[0]).toMatchObject({ object: 2, value: 3 });
    expect(press("tile-4").effects[0]).toMatchObject({ object: 3, value: 2 });
    const scene = press("tile-6");
    // DPT spec §3.18 17.001: scenes are 1..64 for people (the runtime encodes 5 as 0x04).
    expect(scene.effects[0]).toMatchObject({ object: 5, value: 5 });
    expect(scene.transition).toBe("tile.scene-recalled");
    expect(press("tile-8").transition).toBe("tile.value-sent");
  });

  it("counts presses per tile", () => {
    const first = press("tile-2");
    const second = controlPanelType.transition(
      first.state,
      { kind: "button", button: "tile-6", action: "press" },
      context(parameters),
    );
    expect(second.state.presses).toEqual([0, 1, 0, 0, 0, 1, 0, 0]);
  });

  it("ignores releases, telegrams and status tiles, and notes an unknown button", () => {
    const state = controlPanelType.initialState(parameters);
    const ignored = [
      { kind: "button", button: "tile-1", action: "release" },
      { kind: "group.write", object: 6, value: 22.5, source: 0x1114 },
      { kind: "start" },
    ] as const;
    for (const event of ignored)
      expect(controlPanelType.transition(state, event, context(parameters))).toEqual({
        state,
        effects: [],
      });
    expect(press("tile-7").effects).toEqual([{ kind: "note", text: 'no tile button "tile-7"' }]);
    expect(press("tile-99").effects[0]).toMatchObject({ kind: "note" });
    expect(press("tile-7").state).toEqual(state);
  });

  it("refuses tiles that could not send what they promise, naming the field", () => {
    expect(refusal([{ label: "Mode", dpt: "20.105", kind: "toggle" }])).toEqual({
      path: "tiles.0.dpt",
      message: "a toggle tile needs a 1-bit DPT (1.xxx), got 20.105",
    });
    expect(refusal([{ label: "Scene", dpt: "5.001", kind: "scene", value: 2 }])?.path).toBe(
      "tiles.0.dpt",
    );
    expect(refusal([{ label: "Set", dpt: "9.001", kind: "value" }])).toEqual({
      path: "tiles.0.value",
      message: "a value tile needs a preset value to send",
    });
    // DPT spec 20.105: 18 is reserved.
    expect(refusal([{ dpt: "20.105", kind: "value", value: 18 }])?.path).toBe("tiles.0.value");
    // DPT spec §3.18: scene 65 does not exist.
    expect(refusal([{ dpt: "17.001", kind: "scene", value: 65 }])?.path).toBe("tiles.0.value");
    // DPT spec §3.4 5.001: 0..100 %.
    expect(refusal([{ dpt: "5.001", kind: "value", value: 120 }])?.path).toBe("tiles.0.value");
    expect(refusal([{ dpt: "9.999", kind: "status" }])?.path).toBe("tiles.0.dpt");
    expect(refusal([{ label: " ", kind: "status" }])?.path).toBe("tiles.0.label");
    expect(refusal([])?.path).toBe("tiles");
  });
});
