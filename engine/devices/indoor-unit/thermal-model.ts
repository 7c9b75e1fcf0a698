import type { SystemDirection } from "../hvac/hvac-mode";

/** What drives the room during one model step. */
export interface RoomDrive {
  /** "none" when the unit is off or only moves air: the room follows the outdoor temperature. */
  readonly direction: SystemDirection;
  readonly setpointC: number;
  /** Fraction of the full rate (dehumidification cools at a reduced rate). */
  readonly rateFactor: number;
}

export interface RoomModel {
  readonly outdoorC: number;
  readonly timeConstantS: number;
  readonly rateKPerMin: number;
}

/**
 * Advances the room temperature by `dtS` seconds.
 *
 * Undriven, it uses the exact solution of Newton's law of cooling,
 * T(t+dt) = Ta + (T(t) − Ta)·exp(−dt/τ) (any heat-transfer handbook), so the
 * step size does not change the result. Heating or cooling moves the room
 * toward the setpoint at most `rateKPerMin` and never past it, and only in the
 * direction the unit runs. A satisfied unit lets the room drift like an idle one
 * but holds it at the setpoint (the compressor restarts there), so a heating
 * unit never cools a warm room and never lets it fall below the setpoint.
 */
export function stepRoomTemperature(
  roomC: number,
  dtS: number,
  drive: RoomDrive,
  model: RoomModel,
): number {
  if (dtS <= 0) return roomC;
  const driftedC = model.outdoorC + (roomC - model.outdoorC) * Math.exp(-dtS / model.timeConstantS);
  const maxStepK = (model.rateKPerMin * drive.rateFactor * dtS) / 60;
  const setpointC = drive.setpointC;
  if (drive.direction === "heating") {
    return roomC < setpointC
      ? roomC + Math.min(setpointC - roomC, maxStepK)
      : Math.max(driftedC, setpointC);
  }
  if (drive.direction === "cooling") {
    return roomC > setpointC
      ? roomC - Math.min(roomC - setpointC, maxStepK)
      : Math.min(driftedC, setpointC);
  }
  return driftedC;
}
