import type { HvacFaultId } from "../hvac/fault-ids";
import type { HvacMode, SystemDirection } from "../hvac/hvac-mode";
import type { ControllerAnnounce, SystemState } from "../hvac/unit-link-messages";

/** A controller the unit has heard on its link. */
export interface KnownController {
  readonly role: ControllerAnnounce["role"];
  readonly controller: ControllerAnnounce["controller"];
  readonly lastSeenUs: number;
}

/** The real operating state of an indoor unit and its room. */
export interface IndoorUnitState {
  readonly power: boolean;
  readonly mode: HvacMode;
  /** Heating or cooling as auto mode last resolved it (kept with hysteresis). */
  readonly autoDirection: Exclude<SystemDirection, "none">;
  readonly fanLevel: number;
  readonly louvrePercent: number;
  readonly setpointC: number;
  /** The room temperature the unit's own (return-air) sensor read last, °C. */
  readonly roomC: number;
  /** What the unit delivers to its room now: the compressor runs (and the fan is not held). */
  readonly output: "heating" | "cooling" | "dry" | "none";
  /** The compressor (or valve) is on, cycling inside the band around the setpoint. */
  readonly compressorOn: boolean;
  /** Room temperature from the primary gateway's KNX sensor, when one is supplied. */
  readonly externalRoomC: number | null;
  readonly sensorOpen: boolean;
  /** Commands from wall controllers are refused (locked from KNX through the gateway). */
  readonly localLocked: boolean;
  /** Seconds the unit has run since the filter was last reset. */
  readonly filterRunS: number;
  /** Heating to hold the frost-protection minimum. */
  readonly frostActive: boolean;
  /** The fan is held off (hot start or defrost) until heldUntilUs. */
  readonly fanHeld: "hot-start" | "defrost" | null;
  readonly heldUntilUs: number;
  /** Heating was asked for at the last model step (a new start of heating begins a hot start). */
  readonly wasHeating: boolean;
  /** When the next defrost is due while heating; null when not heating. */
  readonly nextDefrostUs: number | null;
  readonly controllers: Readonly<Record<string, KnownController>>;
  readonly linkFault: HvacFaultId | null;
  /** The grace after start is over: a missing primary now counts as a fault. */
  readonly supervising: boolean;
  /** Last word from a shared outdoor unit; null on a single split. */
  readonly system: Omit<SystemState, "kind"> | null;
  readonly lastStepUs: number;
  /** Control temperature last reported on the link (0.01 K steps), to report only changes. */
  readonly reportedRoomC: number | null;
}

/**
 * The same state, rebuilt field by field. The transition passes every new state
 * through here once: V8 gives each object spread's result a shape of its own,
 * and a state spread over and over (`{ ...state, x }` at every step) soon makes
 * every spread in the model take the slow generic path; a state rebuilt here
 * always has one shape, so the spreads stay fast. Must list every field.
 * `reportedRoomC` may be given anew: reporting, which every path ends in, sets it;
 * so may `compressorOn` and `output`: the compressor decision, which most paths
 * run, sets them (a spread there met states of every shape and ran slow);
 * so may `controllers`: every announcement sets them.
 */
export function rebuiltIndoorUnitState(
  s: IndoorUnitState,
  reportedRoomC: number | null = s.reportedRoomC,
  compressorOn: boolean = s.compressorOn,
  output: IndoorUnitState["output"] = s.output,
  controllers: IndoorUnitState["controllers"] = s.controllers,
): IndoorUnitState {
  return {
    power: s.power,
    mode: s.mode,
    autoDirection: s.autoDirection,
    fanLevel: s.fanLevel,
    louvrePercent: s.louvrePercent,
    setpointC: s.setpointC,
    roomC: s.roomC,
    externalRoomC: s.externalRoomC,
    sensorOpen: s.sensorOpen,
    localLocked: s.localLocked,
    filterRunS: s.filterRunS,
    frostActive: s.frostActive,
    fanHeld: s.fanHeld,
    heldUntilUs: s.heldUntilUs,
    wasHeating: s.wasHeating,
    nextDefrostUs: s.nextDefrostUs,
    controllers,
    linkFault: s.linkFault,
    supervising: s.supervising,
    system: s.system,
    lastStepUs: s.lastStepUs,
    reportedRoomC,
    output,
    compressorOn,
  };
}
