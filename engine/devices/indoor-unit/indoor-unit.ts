import { DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K } from "../../room";
import type { DeviceType } from "../device-type";
import { indoorUnitParametersSchema, type IndoorUnitParameters } from "./parameters";
import type { IndoorUnitState } from "./state";
import { indoorUnitTransition } from "./transition";

/**
 * Indoor unit: sits on a unit link (not on KNX), holds the real operating state
 * (power, mode, fan, louvre, setpoint) and the room it conditions, decides which
 * controller may command it (exactly one primary) and, on a multi-split system,
 * obeys the outdoor unit's mode authority.
 */
export const indoorUnitType: DeviceType<IndoorUnitParameters, IndoorUnitState> = {
  id: "indoor-unit",
  label: "Indoor unit",
  description:
    "Air-conditioning indoor unit on a unit link, heating or cooling its room; not on KNX.",
  medium: "unit-link",
  parameters: indoorUnitParametersSchema,
  groupObjects: () => [],
  buttons: () => [],
  initialState: (parameters) => ({
    power: parameters.initialPower,
    mode: parameters.initialMode,
    autoDirection: parameters.initialRoomC < parameters.initialSetpointC ? "heating" : "cooling",
    fanLevel: parameters.initialFanLevel,
    louvrePercent: 0,
    setpointC: parameters.initialSetpointC,
    roomC: parameters.initialRoomC,
    output: "none",
    compressorOn: false,
    externalRoomC: null,
    sensorOpen: false,
    localLocked: false,
    filterRunS: 0,
    frostActive: false,
    fanHeld: null,
    heldUntilUs: 0,
    wasHeating: false,
    nextDefrostUs: null,
    controllers: {},
    linkFault: null,
    supervising: false,
    system: null,
    lastStepUs: 0,
    reportedRoomC: null,
  }),
  transition: indoorUnitTransition,
  // A bench without rooms: the unit's room is its own, from its parameters (as before rooms were shared).
  privateRoom: (p) => ({
    initialC: p.initialRoomC,
    outdoorC: p.outdoorC,
    heatCapacityJPerK: DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K,
    envelopeUaWPerK: DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K / p.timeConstantS,
  }),
  // The console's room chart: the room the unit conditions and what it aims for.
  roomSample: (state) =>
    typeof state.roomC === "number" && typeof state.setpointC === "number"
      ? { roomC: state.roomC, setpointC: state.setpointC, power: state.power === true }
      : undefined,
};
