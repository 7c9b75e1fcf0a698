import { z } from "zod";
import { hvacModeSchema } from "../hvac/hvac-mode";
import { fanLevelSchema } from "../hvac/unit-link-messages";

/** Parameters of an indoor unit and the room it conditions. Temperatures °C, times seconds. */
export const indoorUnitParametersSchema = z.object({
  /** Room temperature at the start of the run. */
  initialRoomC: z.number().min(-30).max(50).default(20),
  /** Outdoor temperature the room drifts toward while the unit is off or only moves air. */
  outdoorC: z.number().min(-40).max(50).default(10),
  /** Time constant τ of the room's first-order cooling toward outdoor (Newton's law of cooling). */
  timeConstantS: z
    .number()
    .positive("timeConstantS must be above 0 s")
    .max(1_000_000)
    .default(3600),
  /** Fastest change heating or cooling can drive the room, kelvin per minute. */
  rateKPerMin: z.number().positive("rateKPerMin must be above 0 K/min").max(10).default(0.2),
  /** Period of the thermal model step, virtual seconds. */
  modelStepS: z.number().min(1).max(600).default(10),
  /** Auto mode switches between heating and cooling this far either side of the setpoint, kelvin. */
  autoHysteresisK: z.number().min(0).max(5).default(0.5),
  initialPower: z.boolean().default(false),
  initialMode: hvacModeSchema.default("auto"),
  initialSetpointC: z.number().min(5).max(40).default(21),
  initialFanLevel: fanLevelSchema.default(0),
  /**
   * Steps in which the unit takes a setpoint, kelvin: 0.5 K and 1 K are usual
   * (common practice, no published source). The unit rounds a commanded setpoint
   * to its nearest step (halves up) and reports the value it took.
   */
  /**
   * Fan running hours after which the unit asks for its filter to be cleaned;
   * 0 = no filter alarm. Manufacturers set a few thousand hours (common
   * practice, no published source); a lab sets minutes to see it.
   */
  filterAlarmAfterH: z.number().min(0).max(20_000).default(0),
  /**
   * Frost / building protection: below this room temperature the unit heats,
   * off or in any mode, until the room is FROST_BAND_K above it. 0 = off;
   * 5..12 °C when on (7 °C is a usual choice; common practice, no published
   * source). A simulation; it does not replace the manufacturer's
   * instructions or local codes for protecting a real building.
   */
  frostProtectionC: z
    .number()
    .refine((c) => c === 0 || (c >= 5 && c <= 12), "frostProtectionC must be 0 (off) or 5..12 °C")
    .default(0),
  /**
   * Hot start: when heating begins the fan is held off this long while the coil
   * warms, so the room gets no cold draught; no heat reaches the room meanwhile.
   * 0 = off. A minute or two is usual (common practice, no published source).
   */
  hotStartS: z.number().int().min(0).max(600).default(0),
  /**
   * Defrost: while heating with the outdoor temperature below
   * defrostBelowOutdoorC, every defrostEveryMin the outdoor coil is defrosted for
   * defrostS, the fan held off and no heat delivered. defrostEveryMin 0 = off
   * (common practice, no published source; figures vary by unit).
   */
  defrostEveryMin: z.number().int().min(0).max(600).default(0),
  defrostS: z.number().int().min(30).max(1800).default(300),
  defrostBelowOutdoorC: z.number().min(-20).max(10).default(3),
  setpointResolutionK: z
    .union([z.literal(0.5), z.literal(1)], { error: "setpointResolutionK must be 0.5 or 1" })
    .default(0.5),
});
export type IndoorUnitParameters = z.infer<typeof indoorUnitParametersSchema>;

/** Frost protection stops heating this far above its minimum (common practice, no published source). */
export const FROST_BAND_K = 2;

/** Setpoints the unit itself accepts, °C; controllers apply their own, narrower limits. */
export const UNIT_SETPOINT_RANGE_C = { min: 5, max: 40 } as const;

/** The setpoint the unit takes for a commanded one: its nearest step (halves up), inside its range. */
export function unitSetpointC(commandedC: number, resolutionK: number): number {
  const stepped = Math.round(commandedC / resolutionK) * resolutionK;
  return Math.min(UNIT_SETPOINT_RANGE_C.max, Math.max(UNIT_SETPOINT_RANGE_C.min, stepped));
}
