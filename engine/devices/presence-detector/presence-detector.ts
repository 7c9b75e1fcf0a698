import { z } from "zod";
import { startupDelaySchema } from "../startup-delay";
import {
  flags,
  type DeviceContext,
  type DeviceEvent,
  type DeviceType,
  type GroupObjectSpec,
  type TransitionResult,
} from "../device-type";

/** Parameters of a presence detector. */
export const presenceDetectorParametersSchema = z.object({
  /** Time occupancy is held after the last movement, seconds; each movement restarts it. */
  holdTimeS: z.number().min(1, "holdTimeS must be at least 1 s").max(86_400).default(300),
  /** A KNX input (DPT 1.018) through which another detector's movement retriggers this one. */
  externalTrigger: z.boolean().default(false),
  /** Delay after bus power returns before occupancy is sent, s. */
  startupDelayS: startupDelaySchema,
});
export type PresenceDetectorParameters = z.infer<typeof presenceDetectorParametersSchema>;

export interface PresenceDetectorState {
  readonly occupied: boolean;
  /** Virtual time of the last movement, µs; null before any. */
  readonly lastMovementUs: number | null;
}

/** Object numbers: occupancy output, optional retrigger input. */
export const presenceObjects = { occupancy: 0, trigger: 1 } as const;

const HOLD_TIMER = "presence.hold";

/**
 * Heat the occupancy it sees adds to its room, W: one seated adult gives off
 * about 70-80 W of sensible heat (from memory of handbook tables); a detector
 * cannot count people, so it stands for one. Ignored when it is in no room.
 */
export const OCCUPANT_SENSIBLE_W = 75;

const occupantHeat = (occupied: boolean) =>
  ({
    kind: "room.drive",
    conductanceWPerK: 0,
    towardC: 0,
    watts: occupied ? OCCUPANT_SENSIBLE_W : 0,
  }) as const;
const US_PER_S = 1_000_000;

type Result = TransitionResult<PresenceDetectorState>;

function movement(
  state: PresenceDetectorState,
  context: DeviceContext<PresenceDetectorParameters>,
): Result {
  const hold = {
    kind: "timer.set" as const,
    name: HOLD_TIMER,
    delayUs: Math.round(context.parameters.holdTimeS * US_PER_S),
  };
  const next = { occupied: true, lastMovementUs: context.nowUs };
  if (state.occupied) return { state: next, effects: [hold], transition: "presence.retriggered" };
  // DPT 1.018 occupancy: 1 = occupied (recalled from memory of the DPT spec).
  return {
    state: next,
    effects: [
      { kind: "group.send", object: presenceObjects.occupancy, service: "write", value: true },
      hold,
      occupantHeat(true),
    ],
    transition: "presence.detected",
  };
}

function presenceDetectorTransition(
  state: PresenceDetectorState,
  event: DeviceEvent,
  context: DeviceContext<PresenceDetectorParameters>,
): Result {
  switch (event.kind) {
    case "start":
      return {
        state,
        effects: [{ kind: "object.store", object: presenceObjects.occupancy, value: false }],
      };
    case "input":
      return event.input === "movement" && event.value !== false
        ? movement(state, context)
        : { state, effects: [] };
    case "button":
      return event.button === "movement" && event.action === "press"
        ? movement(state, context)
        : { state, effects: [] };
    case "group.write":
      return event.object === presenceObjects.trigger &&
        context.parameters.externalTrigger &&
        event.value === true
        ? movement(state, context)
        : { state, effects: [] };
    case "timer":
      if (event.name !== HOLD_TIMER || !state.occupied) return { state, effects: [] };
      return {
        state: { ...state, occupied: false },
        effects: [
          { kind: "group.send", object: presenceObjects.occupancy, service: "write", value: false },
          occupantHeat(false),
        ],
        transition: "presence.ended",
      };
    default:
      return { state, effects: [] };
  }
}

/**
 * Presence detector: sends occupied (DPT 1.018) on the first movement and not
 * occupied once the hold time has passed without movement; every movement
 * (input "movement", the "movement" button, or the optional KNX trigger) restarts the hold time.
 */
export const presenceDetectorType: DeviceType<PresenceDetectorParameters, PresenceDetectorState> = {
  id: "presence-detector",
  label: "Presence detector",
  description: "Occupancy (DPT 1.018) with a hold time that each movement restarts.",
  medium: "knx",
  parameters: presenceDetectorParametersSchema,
  startupDelayS: (p) => p.startupDelayS,
  groupObjects: (p) => {
    const objects: GroupObjectSpec[] = [
      {
        number: presenceObjects.occupancy,
        name: "Occupancy",
        dpt: "1.018",
        flags: flags("CRT"),
        role: "output",
      },
    ];
    if (p.externalTrigger)
      objects.push({
        number: presenceObjects.trigger,
        name: "Movement from another detector",
        dpt: "1.018",
        flags: flags("CW"),
        role: "input",
      });
    return objects;
  },
  buttons: () => [{ id: "movement", label: "Movement" }],
  initialState: () => ({ occupied: false, lastMovementUs: null }),
  transition: presenceDetectorTransition,
};
