import type { DeviceType } from "../device-type";
import { initialSenderState } from "../hvac/room-temperature-sending";
import { gatewayGroupObjects } from "./objects";
import { gatewaySendingConditions } from "./sending-conditions";
import { hvacGatewayParametersSchema, type HvacGatewayParameters } from "./parameters";
import type { HvacGatewayState } from "./state";
import { hvacGatewayTransition } from "./transition";

/**
 * HVAC gateway: bridges one indoor unit (or one multi-split member) to KNX.
 * KNX commands (power, setpoint, mode or heat/cool, fan, louvre, scenes) become
 * unit-link commands; the unit's status comes back as status telegrams, whoever
 * changed it (KNX, a wall controller, the outdoor unit). On the unit link it is
 * a controller with its own primary/secondary role.
 */
export const hvacGatewayType: DeviceType<HvacGatewayParameters, HvacGatewayState> = {
  id: "hvac-gateway",
  label: "HVAC gateway",
  description:
    "KNX gateway for one air-conditioning indoor unit: command/status pairs, scenes, window contact, lock, fault objects.",
  medium: "knx",
  parameters: hvacGatewayParametersSchema,
  groupObjects: gatewayGroupObjects,
  buttons: () => [],
  startupDelayS: (p) => p.startupDelayS,
  sendingConditions: gatewaySendingConditions,
  initialState: () => ({
    announcedRole: null,
    unit: null,
    pendingStatus: [],
    locked: false,
    windowOpen: false,
    windowOpening: false,
    powerAfterWindow: false,
    learnedScenes: {},
    faults: [],
    roomSender: initialSenderState,
    modeRequest: null,
    modeConflict: false,
    baseSetpointC: null,
    shiftK: 0,
    operatingMode: 1,
    occupied: null,
    gatewayFaults: [],
  }),
  transition: hvacGatewayTransition,
};
