/**
 * One room as a single lumped thermal mass (the lumped-capacitance method of
 * any heat-transfer handbook, chapter on transient conduction):
 *
 *   C·dT/dt = UA·(T_out − T) + Σ G_i·(T_i − T) + Σ P_i
 *
 * C is the room's heat capacity (J/K), UA its envelope loss to the outdoor air
 * (W/K). Every device acting on the room adds one linear term: a unit running
 * moves air at its supply temperature T_i through an air-side conductance G_i
 * (W/K), an open window adds ventilation towards T_out, people add a fixed P_i
 * (W). The sum is again linear in T, so between two changes of the terms the
 * solution is exact and closed-form:
 *
 *   T(t) = T_eq + (T_0 − T_eq)·exp(−t/τ),
 *   T_eq = (UA·T_out + Σ G_i·T_i + Σ P_i) / (UA + Σ G_i),   τ = C / (UA + Σ G_i)
 *
 * Nothing ticks: a room is evaluated only when a device reads it or its terms
 * change. Because T moves monotonically from T_0 towards T_eq, it never leaves
 * the interval they span and never jumps.
 */

/** The fixed physics of a room. */
export interface RoomThermalSpec {
  /** Effective heat capacity of air, furnishings and inner surfaces, J/K. */
  readonly heatCapacityJPerK: number;
  /** Heat loss through the envelope (walls, windows, infiltration) per kelvin to outdoors, W/K. */
  readonly envelopeUaWPerK: number;
  /** Outdoor air temperature the envelope loses heat to, °C. */
  readonly outdoorC: number;
}

/** A room's physics and its temperature at the start of a run. */
export interface RoomSpec extends RoomThermalSpec {
  readonly initialC: number;
}

/** One device's share of the room's heat balance: G·(towardC − T) + watts. */
export interface RoomDrive {
  /** Conductance towards `towardC`, W/K (≥ 0): a unit's air side, a window's ventilation. */
  readonly conductanceWPerK: number;
  /** Temperature the conductance pulls towards, °C (a unit's supply air, the outdoor air). */
  readonly towardC: number;
  /** Heat added regardless of temperature, W (people, equipment); negative removes heat. */
  readonly watts: number;
}

/** No share at all: the device is off or in no room. */
export const NO_DRIVE: RoomDrive = { conductanceWPerK: 0, towardC: 0, watts: 0 };

/** The sum of a room's envelope and drives, in the form the closed solution needs. */
export interface RoomBalance {
  /** UA + Σ G_i, W/K (> 0 for any real room). */
  readonly conductanceWPerK: number;
  /** UA·T_out + Σ G_i·T_i + Σ P_i, W. */
  readonly sourceW: number;
}

/** The balance of a room's envelope plus `drives`. */
export function roomBalance(spec: RoomThermalSpec, drives: Iterable<RoomDrive>): RoomBalance {
  let conductanceWPerK = spec.envelopeUaWPerK;
  let sourceW = spec.envelopeUaWPerK * spec.outdoorC;
  for (const drive of drives) {
    conductanceWPerK += drive.conductanceWPerK;
    sourceW += drive.conductanceWPerK * drive.towardC + drive.watts;
  }
  return { conductanceWPerK, sourceW };
}

/** The temperature the room settles at under `balance`, °C. */
export function equilibriumC(balance: RoomBalance): number {
  return balance.sourceW / balance.conductanceWPerK;
}

/** The time constant of the approach to equilibrium, s: C / (UA + Σ G_i). */
export function timeConstantS(spec: RoomThermalSpec, balance: RoomBalance): number {
  return spec.heatCapacityJPerK / balance.conductanceWPerK;
}

/** The room temperature `dtS` seconds after it was `startC`, under an unchanged balance (exact). */
export function temperatureAfterC(
  startC: number,
  dtS: number,
  spec: RoomThermalSpec,
  balance: RoomBalance,
): number {
  if (dtS <= 0) return startC;
  const targetC = equilibriumC(balance);
  return targetC + (startC - targetC) * Math.exp(-dtS / timeConstantS(spec, balance));
}

/**
 * Seconds until the room, now at `startC`, reaches `thresholdC` under an
 * unchanged balance; Infinity when it never does (the threshold is not between
 * now and equilibrium). Inverse of `temperatureAfterC`.
 */
export function secondsToReach(
  startC: number,
  thresholdC: number,
  spec: RoomThermalSpec,
  balance: RoomBalance,
): number {
  const targetC = equilibriumC(balance);
  const gapNow = startC - targetC;
  const gapThen = thresholdC - targetC;
  if (gapNow === 0 || gapThen === 0 || Math.sign(gapNow) !== Math.sign(gapThen)) return Infinity;
  if (Math.abs(gapThen) > Math.abs(gapNow)) return Infinity;
  return timeConstantS(spec, balance) * Math.log(gapNow / gapThen);
}
