import type {
  DeviceContext,
  DeviceEffect,
  DeviceEvent,
  DeviceType,
  TransitionResult,
} from "../device-type";
import {
  linkFaultEffects,
  periodicAnnounceEffects,
  withRoleAnnouncement,
} from "../hvac/controller-link";
import { hvacModes, type HvacMode } from "../hvac/hvac-mode";
import {
  parseUnitLinkMessage,
  type ControllerRole,
  type UnitCommand,
} from "../hvac/unit-link-messages";
import { wallControllerParametersSchema, type WallControllerParameters } from "./parameters";

/** What the controller's display shows; follows the unit's status messages. */
export interface WallControllerDisplay {
  readonly power: boolean;
  readonly mode: HvacMode;
  readonly setpointC: number;
  readonly roomC: number | null;
  readonly fanLevel: number;
}

export interface WallControllerState {
  /** The role last announced on the link; a bench edit is announced on the next transition. */
  readonly announcedRole: ControllerRole | null;
  /** Null until the unit has reported once. */
  readonly display: WallControllerDisplay | null;
  /** Faults the display shows, e.g. "link.two-primaries". */
  readonly faults: readonly string[];
}

type Context = DeviceContext<WallControllerParameters>;
type Result = TransitionResult<WallControllerState>;

function command(message: Omit<UnitCommand, "kind">, context: Context): DeviceEffect[] {
  return context.links.map((link) => ({
    kind: "link.send",
    link,
    message: { kind: "unit.command", ...message },
  }));
}

function press(state: WallControllerState, button: string, context: Context): Result {
  const display = state.display;
  if (display === null)
    return {
      state,
      effects: [{ kind: "note", text: "no unit has reported yet" }],
      transition: "button.no-unit",
    };
  const { setpointStepK, setpointMinC, setpointMaxC } = context.parameters;
  switch (button) {
    case "power":
      return {
        state,
        effects: command({ power: !display.power }, context),
        transition: display.power ? "button.power-off" : "button.power-on",
      };
    case "setpoint-up":
    case "setpoint-down": {
      const wantedC =
        display.setpointC + (button === "setpoint-up" ? setpointStepK : -setpointStepK);
      const setpointC =
        Math.round(Math.min(setpointMaxC, Math.max(setpointMinC, wantedC)) * 100) / 100;
      // Shown at once, so quick presses add up before the unit answers.
      const next = { ...state, display: { ...display, setpointC } };
      return {
        state: next,
        effects: command({ setpointC }, context),
        transition: setpointC === wantedC ? `button.${button}` : "setpoint.clamped",
      };
    }
    case "mode": {
      const mode = hvacModes[(hvacModes.indexOf(display.mode) + 1) % hvacModes.length] ?? "auto";
      return {
        state: { ...state, display: { ...display, mode } },
        effects: command({ mode }, context),
        transition: "button.mode",
      };
    }
    default:
      return { state, effects: [] };
  }
}

function receive(state: WallControllerState, raw: unknown, context: Context): Result {
  const message = parseUnitLinkMessage(raw);
  if (message?.kind !== "unit.status") return { state, effects: [] };
  const display = {
    power: message.power,
    mode: message.mode,
    setpointC: message.setpointC,
    roomC: message.roomC,
    fanLevel: message.fanLevel,
  };
  const faults = linkFaultEffects(state.faults, message);
  // Written out rather than spread: a spread's result gets a shape of its own, which makes later spreads slow.
  const next = { announcedRole: state.announcedRole, display, faults: message.faults };
  const refusedHere =
    message.refusal?.controller === context.deviceId ? message.refusal.transition : undefined;
  const transition = faults.changed ?? refusedHere;
  return {
    state: next,
    effects: faults.effects,
    ...(transition === undefined ? {} : { transition }),
  };
}

function wallControllerTransition(
  state: WallControllerState,
  event: DeviceEvent,
  context: Context,
): Result {
  const role = context.parameters.role;
  return withRoleAnnouncement(state, event, role, "wall-controller", context.links, (current) => {
    switch (event.kind) {
      case "start":
        return {
          state: { ...current, announcedRole: role },
          effects: periodicAnnounceEffects(role, "wall-controller", context.links),
          transition: "controller.started",
        };
      case "button":
        return event.action === "press"
          ? press(current, event.button, context)
          : { state: current, effects: [] };
      case "link.receive":
        return receive(current, event.message, context);
      default:
        return { state: current, effects: [] };
    }
  });
}

/**
 * Wired wall controller on a unit link: local keys for power, setpoint up/down and
 * mode, a display of what the unit runs and its faults, and a primary/secondary role.
 */
export const wallControllerType: DeviceType<WallControllerParameters, WallControllerState> = {
  id: "wall-controller",
  label: "Wall controller",
  description:
    "Wired controller of an indoor unit with power, setpoint and mode keys; on the unit link, not on KNX.",
  medium: "unit-link",
  parameters: wallControllerParametersSchema,
  groupObjects: () => [],
  buttons: () => [
    { id: "power", label: "Power" },
    { id: "setpoint-up", label: "Setpoint +" },
    { id: "setpoint-down", label: "Setpoint −" },
    { id: "mode", label: "Mode" },
  ],
  initialState: () => ({ announcedRole: null, display: null, faults: [] }),
  transition: wallControllerTransition,
};
