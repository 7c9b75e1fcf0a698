import {
  COOLING_RATING_ROOM_C,
  COOLING_SUPPLY_C,
  HEATING_RATING_ROOM_C,
  HEATING_SUPPLY_C,
  NO_DRIVE,
  type RoomDrive,
} from "../../room";
import type { IndoorUnitState } from "./state";

/** Dehumidification runs the coil at a reduced air-side output (common practice, no published source). */
const DRY_OUTPUT_FACTOR = 0.5;

/**
 * What a unit delivering `output` adds to its room's heat balance
 * (engine/room/lumped-room.ts): its supply air through an air-side conductance
 * G = capacity / (supply − rating room temperature), so Q = G·(T_supply − T)
 * is the nominal capacity at the rating temperature and falls to zero as the
 * room nears the supply temperature, which it therefore never passes.
 */
export function unitDrive(output: IndoorUnitState["output"], capacityW: number): RoomDrive {
  switch (output) {
    case "heating":
      return {
        conductanceWPerK: capacityW / (HEATING_SUPPLY_C - HEATING_RATING_ROOM_C),
        towardC: HEATING_SUPPLY_C,
        watts: 0,
      };
    case "cooling":
    case "dry":
      return {
        conductanceWPerK:
          (capacityW / (COOLING_RATING_ROOM_C - COOLING_SUPPLY_C)) *
          (output === "dry" ? DRY_OUTPUT_FACTOR : 1),
        towardC: COOLING_SUPPLY_C,
        watts: 0,
      };
    case "none":
      return NO_DRIVE;
  }
}

/**
 * Whether the compressor runs after a reading of `controlC`: on/off control
 * with hysteresis around the setpoint (common practice, no published source).
 * Heating stops at setpoint + band/2 and restarts at setpoint − band/2; cooling
 * is mirrored; between the edges it keeps what it was doing.
 */
export function compressorRuns(
  wasOn: boolean,
  direction: "heating" | "cooling",
  controlC: number,
  setpointC: number,
  bandK: number,
): boolean {
  const half = bandK / 2;
  if (direction === "heating") {
    if (controlC >= setpointC + half) return false;
    if (controlC <= setpointC - half) return true;
    return wasOn;
  }
  if (controlC <= setpointC - half) return false;
  if (controlC >= setpointC + half) return true;
  return wasOn;
}
