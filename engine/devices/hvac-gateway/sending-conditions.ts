import type { SendingCondition } from "../device-type";
import { roomTemperatureSendingConditions } from "../hvac/room-temperature-sending";
import { gatewayGroupObjects, gatewayObjects } from "./objects";
import type { HvacGatewayParameters } from "./parameters";

/**
 * The gateway learns the room temperature from its unit, which may report a new
 * value at any second: on-change sending without a minimum interval is taken at
 * one send per second (the estimate's worst case).
 */
const ROOM_VALUE_PERIOD_S = 1;

/**
 * What a gateway sends on its own: its room temperature as configured, and the
 * status heartbeat (`statusCycleS`), which sends every status object again, the
 * room temperature included unless its sending is off (transition.ts, onStatusCycle).
 */
export function gatewaySendingConditions(p: HvacGatewayParameters): SendingCondition[] {
  const conditions = roomTemperatureSendingConditions(
    p.roomTemperatureSending,
    "roomTemperatureSending",
    gatewayObjects.roomTemperature,
    ROOM_VALUE_PERIOD_S,
  );
  if (p.statusCycleS > 0) {
    const objects = gatewayGroupObjects(p)
      .filter((o) => o.role === "status")
      .map((o) => o.number)
      .filter(
        (n) => n !== gatewayObjects.roomTemperature || p.roomTemperatureSending.mode !== "off",
      );
    conditions.push({
      parameter: "statusCycleS",
      periodS: p.statusCycleS,
      objects,
      basis: `status heartbeat every ${p.statusCycleS} s`,
    });
  }
  return conditions;
}
