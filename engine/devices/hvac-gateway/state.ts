import type { HvacMode } from "../hvac/hvac-mode";
import type { RoomTemperatureSenderState } from "../hvac/room-temperature-sending";
import type { ControllerRole, UnitStatus } from "../hvac/unit-link-messages";

/** The functions whose status a command asks for; the next unit status sends them even when unchanged. */
export type GatewayFunction = "power" | "setpoint" | "mode" | "fan" | "louvre";

/** What a scene slot sets, as learned from the unit. */
export interface LearnedScene {
  readonly power: boolean;
  readonly mode: HvacMode;
  readonly fanLevel: number;
  readonly setpointC: number;
}

export interface HvacGatewayState {
  readonly announcedRole: ControllerRole | null;
  /** The unit's last status; null until it first reports. */
  readonly unit: UnitStatus | null;
  readonly pendingStatus: readonly GatewayFunction[];
  readonly locked: boolean;
  readonly windowOpen: boolean;
  /** The window opened and the contact delay is running; the unit has not stopped yet. */
  readonly windowOpening: boolean;
  /** Power to restore when the window closes (updated by power commands while it is open). */
  readonly powerAfterWindow: boolean;
  /** Scenes learned by DPT 18.001, keyed by scene number 1..64; they override the parameter slots. */
  readonly learnedScenes: Readonly<Record<number, LearnedScene>>;
  /** Faults the gateway reports on its fault objects. */
  readonly faults: readonly string[];
  readonly roomSender: RoomTemperatureSenderState;
  /** The mode last asked for on KNX, kept while the outdoor unit refuses it and re-sent once allowed. */
  readonly modeRequest: HvacMode | null;
  /** The outdoor unit refuses `modeRequest`; reported on the mode conflict object (multi-split). */
  readonly modeConflict: boolean;
  /** The last absolute setpoint from KNX (null until one arrives: the unit's own then counts). */
  readonly baseSetpointC: number | null;
  /** The setpoint shift in force, kelvin. */
  readonly shiftK: number;
  /** DPT 20.102 operating mode from KNX (1 comfort until told otherwise). */
  readonly operatingMode: number;
  /** Presence from KNX; null until a presence value arrives. */
  readonly occupied: boolean | null;
  /** Faults the gateway itself detects (supervision), reported beside the unit's on the fault objects. */
  readonly gatewayFaults: readonly string[];
}

/**
 * The same state, rebuilt field by field. The transition passes every new state
 * through here once: V8 gives each object spread's result a shape of its own,
 * and a state spread over and over (`{ ...state, x }` at every event) soon makes
 * every spread in the model take the slow generic path; a state rebuilt here
 * always has one shape, so the spreads stay fast. Must list every field.
 */
export function rebuiltGatewayState(s: HvacGatewayState): HvacGatewayState {
  return {
    announcedRole: s.announcedRole,
    unit: s.unit,
    pendingStatus: s.pendingStatus,
    locked: s.locked,
    windowOpen: s.windowOpen,
    windowOpening: s.windowOpening,
    powerAfterWindow: s.powerAfterWindow,
    learnedScenes: s.learnedScenes,
    faults: s.faults,
    roomSender: s.roomSender,
    modeRequest: s.modeRequest,
    modeConflict: s.modeConflict,
    baseSetpointC: s.baseSetpointC,
    shiftK: s.shiftK,
    operatingMode: s.operatingMode,
    occupied: s.occupied,
    gatewayFaults: s.gatewayFaults,
  };
}
