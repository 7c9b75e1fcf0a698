import { z } from "zod";
import { dptIds, getDpt } from "../../dpt";
import {
  flags,
  type DeviceEffect,
  type DeviceType,
  type GroupObjectSpec,
  type LocalButtonSpec,
} from "../device-type";

/**
 * A control panel: a wall or desk panel of tiles, each bound to one group
 * object. It is what a person uses from the live console to drive a bench the
 * way a visualisation would.
 *
 * Tile kinds:
 * - toggle: a 1-bit DPT (1.001 switch, 1.100 heat/cool …). A press sends the
 *   opposite of the object's value.
 * - value: any DPT; a press sends the tile's preset `value` (a percentage on
 *   5.001, a setpoint on 9.001, a mode code on 20.105, a fan level on 5.100 …).
 * - scene: 17.001; a press recalls the preset scene (1..64).
 * - status: any DPT; shows what it hears, has no button and never sends.
 *
 * Object number = tile index (0-based). Command tiles (toggle, value, scene)
 * have flags C W T U: they send on their first linked address, and linking the
 * matching status address as a further (listening) address keeps the tile in
 * step with the device's feedback, which devices send as writes (hence W) or as
 * responses to reads (hence U) — the usual wiring of a visualisation tile.
 * Status tiles have C W U: they only listen.
 */

/** DPT ids from the engine's registry that a tile may carry. */
const tileDptSchema = z.enum(dptIds as [string, ...string[]], {
  error: "not a DPT in the engine's registry",
});

export const controlPanelTileSchema = z
  .object({
    /** Text on the tile and name of its group object. */
    label: z.string().trim().min(1, "a tile needs a label").max(40).default("Switch"),
    dpt: tileDptSchema.default("1.001"),
    kind: z.enum(["toggle", "value", "scene", "status"]).default("toggle"),
    /** What a value or scene tile sends when pressed, as the DPT's value (number, boolean or text). */
    value: z.union([z.number(), z.boolean(), z.string()]).optional(),
  })
  .superRefine((tile, ctx) => {
    const codec = getDpt(tile.dpt);
    if (codec === undefined) return; // reported by the enum
    if (tile.kind === "toggle" && codec.sizeBits !== 1)
      ctx.addIssue({
        code: "custom",
        path: ["dpt"],
        message: `a toggle tile needs a 1-bit DPT (1.xxx), got ${tile.dpt}`,
      });
    if (tile.kind === "scene" && tile.dpt !== "17.001")
      ctx.addIssue({
        code: "custom",
        path: ["dpt"],
        message: `a scene tile sends DPT 17.001, got ${tile.dpt}`,
      });
    if (tile.kind === "value" || tile.kind === "scene") {
      if (tile.value === undefined) {
        ctx.addIssue({
          code: "custom",
          path: ["value"],
          message: `a ${tile.kind} tile needs a preset value to send`,
        });
        return;
      }
      const encoded = codec.encode(tile.value);
      if (!encoded.ok)
        ctx.addIssue({ code: "custom", path: ["value"], message: encoded.error.message });
    }
  });

export const controlPanelParametersSchema = z.object({
  tiles: z
    .array(controlPanelTileSchema)
    .min(1)
    .max(64)
    .default([{ label: "Switch", dpt: "1.001", kind: "toggle" }]),
});

export type ControlPanelTile = z.infer<typeof controlPanelTileSchema>;
export type ControlPanelParameters = z.infer<typeof controlPanelParametersSchema>;

/** How often each tile has been pressed; status tiles stay at 0. */
export interface ControlPanelState {
  readonly presses: readonly number[];
}

/** The local button of tile `index` (0-based): "tile-1", "tile-2" … */
export function controlPanelButtonId(index: number): string {
  return `tile-${index + 1}`;
}

/** Whether a tile sends when pressed (toggle, value, scene) rather than only showing (status). */
export function isCommandTile(tile: ControlPanelTile): boolean {
  return tile.kind !== "status";
}

export const controlPanelType: DeviceType<ControlPanelParameters, ControlPanelState> = {
  id: "control-panel",
  label: "Control panel",
  description:
    "Panel of tiles bound to group addresses: toggle, preset value, scene or status per tile, pressed from the live console.",
  medium: "knx",
  parameters: controlPanelParametersSchema,

  groupObjects(parameters): readonly GroupObjectSpec[] {
    return parameters.tiles.map((tile, index) => ({
      number: index,
      name: tile.label,
      dpt: tile.dpt,
      flags: flags(isCommandTile(tile) ? "CWTU" : "CWU"),
      // A status tile takes in another device's feedback: an input to the panel.
      role: isCommandTile(tile) ? "command" : "input",
    }));
  },

  buttons(parameters): readonly LocalButtonSpec[] {
    const buttons: LocalButtonSpec[] = [];
    parameters.tiles.forEach((tile, index) => {
      if (isCommandTile(tile)) buttons.push({ id: controlPanelButtonId(index), label: tile.label });
    });
    return buttons;
  },

  initialState(parameters) {
    return { presses: parameters.tiles.map(() => 0) };
  },

  transition(state, event, context) {
    if (event.kind !== "button" || event.action !== "press") return { state, effects: [] };
    const index = context.parameters.tiles.findIndex(
      (_, i) => controlPanelButtonId(i) === event.button,
    );
    const tile = context.parameters.tiles[index];
    if (tile === undefined || !isCommandTile(tile))
      return { state, effects: [{ kind: "note", text: `no tile button "${event.button}"` }] };
    const presses = state.presses.map((count, i) => (i === index ? count + 1 : count));
    let effect: DeviceEffect;
    let transition: string;
    if (tile.kind === "toggle") {
      const next = context.objectValue(index) !== true;
      effect = { kind: "group.send", object: index, service: "write", value: next };
      transition = next ? "tile.toggled-on" : "tile.toggled-off";
    } else {
      // The schema guarantees a preset the DPT encodes for value and scene tiles.
      effect = { kind: "group.send", object: index, service: "write", value: tile.value };
      transition = tile.kind === "scene" ? "tile.scene-recalled" : "tile.value-sent";
    }
    return { state: { presses }, effects: [effect], transition };
  },
};
