import { z } from "zod";
import { startupDelaySchema } from "../startup-delay";
import { NO_DRIVE } from "../../room";
import {
  flags,
  type DeviceContext,
  type DeviceEffect,
  type DeviceEvent,
  type DeviceType,
  type TransitionResult,
} from "../device-type";

/**
 * A binary input for a potential-free contact, usually a window or door contact.
 * DPT 1.019 window/door: 0 closed, 1 open (recalled from memory of the DPT spec);
 * as a plain switch input it sends DPT 1.001 (0 off, 1 on).
 */
export const binaryInputParametersSchema = z.object({
  dpt: z.enum(["1.019", "1.001"]).default("1.019"),
  /** Send the opposite of the contact (a contact that closes when the window opens). */
  invert: z.boolean().default(false),
  /** Contact state at the start of the run; true = open. */
  initiallyOpen: z.boolean().default(false),
  /** Delay after bus power returns before the contact state is sent, s. */
  startupDelayS: startupDelaySchema,
});
export type BinaryInputParameters = z.infer<typeof binaryInputParametersSchema>;

export interface BinaryInputState {
  /** The contact is open (window open). */
  readonly open: boolean;
}

/** The input's only group object. */
export const BINARY_INPUT_OBJECT = 0;

function transitionName(p: BinaryInputParameters, open: boolean): string {
  if (p.dpt === "1.019") return open ? "window.opened" : "window.closed";
  return open ? "input.opened" : "input.closed";
}

/**
 * An open window in the room's heat balance: ventilation towards the outdoor
 * air, G = ρ·c_p·V̇ (handbook air properties, 0.34 W/(m³·K) per m³/h).
 * About 600 m³/h through one wide-open window is the order of magnitude (from
 * memory; it depends on wind and the temperature difference), so 200 W/K.
 */
export const OPEN_WINDOW_W_PER_K = 200;

/** A window contact (DPT 1.019) in a room ventilates it while open; other contacts do nothing to a room. */
function windowDrive(p: BinaryInputParameters, open: boolean, context: Context): DeviceEffect[] {
  const outdoorC = context.roomOutdoorC();
  if (p.dpt !== "1.019" || outdoorC === undefined) return [];
  return [
    open
      ? { kind: "room.drive", conductanceWPerK: OPEN_WINDOW_W_PER_K, towardC: outdoorC, watts: 0 }
      : { kind: "room.drive", ...NO_DRIVE },
  ];
}

type Context = DeviceContext<BinaryInputParameters>;

function binaryInputTransition(
  state: BinaryInputState,
  event: DeviceEvent,
  context: Context,
): TransitionResult<BinaryInputState> {
  const p = context.parameters;
  const value = (open: boolean) => open !== p.invert;
  if (event.kind === "start")
    return {
      state,
      effects: [
        { kind: "object.store", object: BINARY_INPUT_OBJECT, value: value(state.open) },
        ...(state.open ? windowDrive(p, true, context) : []),
      ],
    };
  let open: boolean;
  if (event.kind === "input" && event.input === "contact") open = event.value === true;
  else if (event.kind === "button" && event.button === "toggle" && event.action === "press")
    open = !state.open;
  else return { state, effects: [] };
  if (open === state.open) return { state, effects: [] };
  return {
    state: { open },
    effects: [
      { kind: "group.send", object: BINARY_INPUT_OBJECT, service: "write", value: value(open) },
      ...windowDrive(p, open, context),
    ],
    transition: transitionName(p, open),
  };
}

/** Binary input / window contact: sends on every change of its contact (input "contact", or the "toggle" button). */
export const binaryInputType: DeviceType<BinaryInputParameters, BinaryInputState> = {
  id: "binary-input",
  label: "Binary input",
  description: "Contact input, usually a window contact (DPT 1.019); sends on every change.",
  medium: "knx",
  parameters: binaryInputParametersSchema,
  startupDelayS: (p) => p.startupDelayS,
  groupObjects: (p) => [
    {
      number: BINARY_INPUT_OBJECT,
      name: p.dpt === "1.019" ? "Window contact" : "Contact",
      dpt: p.dpt,
      flags: flags("CRT"),
      role: "output",
    },
  ],
  buttons: () => [{ id: "toggle", label: "Open / close" }],
  initialState: (p) => ({ open: p.initiallyOpen }),
  transition: binaryInputTransition,
};
