import { z } from "zod";
import { hvacModeSchema } from "../hvac/hvac-mode";
import { fanLevelSchema } from "../hvac/unit-link-messages";
import { DEFAULT_CYCLE_BAND_K } from "../../room";

/**
 * Parameters of an indoor unit. Temperatures °C, times seconds. The unit heats
 * or cools the room the bench puts it in (engine/room); `initialRoomC`,
 * `outdoorC` and `timeConstantS` describe a room of its own and count only when
 * the bench puts it in no room.
 */
export const indoorUnitParametersSchema = z.object({
  /** Own room only: room temperature at the start of the run. */
  initialRoomC: z.number().min(-30).max(50).default(20),
  /** Own room only: outdoor temperature the room loses heat to. */
  outdoorC: z.number().min(-40).max(50).default(10),
  /**
   * Own room only: time constant τ = C/UA of the room cooling toward outdoor,
   * with C = DEFAULT_ROOM_HEAT_CAPACITY_J_PER_K; the default matches the default
   * room (600 kJ/K over 50 W/K).
   */
  timeConstantS: z
    .number()
    .positive("timeConstantS must be above 0 s")
    .max(1_000_000)
    .default(12_000),
  /**
   * Nominal heating and cooling output, W, at the rating room temperatures
   * (engine/room/room-constants.ts); the output falls as the room approaches the
   * supply air temperature. 2.5 kW is a usual small wall unit (common practice,
   * no published source).
   */
  capacityW: z.number().min(500).max(20_000).default(2500),
  /** Band the compressor holds the room in around the setpoint, K (DEFAULT_CYCLE_BAND_K). */
  cycleBandK: z.number().min(0.2).max(4).default(DEFAULT_CYCLE_BAND_K),
  /** Period at which the unit reads its room and decides, virtual seconds (its control loop). */
  modelStepS: z.number().min(1).max(600).default(10),
  /** Auto mode changes direction this far beyond the cycling band's edge, kelvin. */
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
