/** Shared pieces of the HVAC family: modes, fault ids, the unit-link protocol, and sending rules (the bench rules are in engine/checks/hvac-rules.ts). */
export { faultDisplayText, hvacFaults, type HvacFaultId } from "./fault-ids";
export {
  dpt1100FromMode,
  dpt20105FromMode,
  hvacModes,
  modeFromDpt1100,
  modeFromDpt20105,
  type HvacMode,
  type SystemDirection,
} from "./hvac-mode";
export {
  roomTemperatureSendingSchema,
  type RoomTemperatureSending,
} from "./room-temperature-sending";
export { unitLinkMessageSchema, type UnitLinkMessage } from "./unit-link-messages";
