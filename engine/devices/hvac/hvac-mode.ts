import { z } from "zod";

/** The operating modes an indoor unit runs: automatic, heating, cooling, fan only, dehumidification ("dry"). */
export const hvacModeSchema = z.enum(["auto", "heat", "cool", "fan", "dry"]);
export type HvacMode = z.infer<typeof hvacModeSchema>;

/** Every mode, in the order a wall controller's mode key steps through them. */
export const hvacModes: readonly HvacMode[] = hvacModeSchema.options;

/**
 * Which way a multi-split system moves heat. The shared outdoor unit runs one
 * refrigerant cycle, so all members must agree on heating or cooling;
 * "none" means no member holds mode authority (nothing heats or cools).
 */
export const systemDirectionSchema = z.enum(["none", "heating", "cooling"]);
export type SystemDirection = z.infer<typeof systemDirectionSchema>;

// DPT spec §4 (20.105 HVAC controller mode): 0 auto, 1 heat, 3 cool, 9 fan only, 14 dehumidification.
const modeByDpt20105 = new Map<number, HvacMode>([
  [0, "auto"],
  [1, "heat"],
  [3, "cool"],
  [9, "fan"],
  [14, "dry"],
]);
const dpt20105ByMode: Readonly<Record<HvacMode, number>> = {
  auto: 0,
  heat: 1,
  cool: 3,
  fan: 9,
  dry: 14,
};

/** The DPT 20.105 code (0 auto, 1 heat, 3 cool, 9 fan only, 14 dehumidification) of a unit mode. */
export function dpt20105FromMode(mode: HvacMode): number {
  return dpt20105ByMode[mode];
}

/** The unit mode for a DPT 20.105 code, or undefined for a code the unit cannot run (e.g. 6 off, 7 test). */
export function modeFromDpt20105(code: number): HvacMode | undefined {
  return modeByDpt20105.get(code);
}

/** DPT 1.100 heat/cool: false (0) = cooling, true (1) = heating (DPT spec §4.2). */
export function modeFromDpt1100(heating: boolean): HvacMode {
  return heating ? "heat" : "cool";
}

/**
 * DPT 1.100 status for the mode the unit runs: heat -> true, cool and dry -> false
 * (dehumidification runs the refrigerant cycle as cooling); fan has no heat/cool
 * meaning, so undefined (the status keeps its last value).
 */
export function dpt1100FromMode(
  mode: HvacMode,
  autoDirection: SystemDirection,
): boolean | undefined {
  if (mode === "heat") return true;
  if (mode === "cool" || mode === "dry") return false;
  if (mode === "auto") return autoDirection === "none" ? undefined : autoDirection === "heating";
  return undefined;
}

/** The direction a running unit asks of the outdoor unit; auto follows the direction it resolved. */
export function directionOfMode(mode: HvacMode, autoDirection: SystemDirection): SystemDirection {
  switch (mode) {
    case "heat":
      return "heating";
    case "cool":
    case "dry":
      return "cooling";
    case "fan":
      return "none";
    case "auto":
      return autoDirection;
  }
}

/**
 * Modes a member without mode authority may run while the system moves heat one way.
 * Common practice, no published source: heating allows heat or fan; cooling allows cool, fan or dry.
 */
export function modesAllowedFor(direction: SystemDirection): readonly HvacMode[] {
  switch (direction) {
    case "none":
      return hvacModes;
    case "heating":
      return ["heat", "fan"];
    case "cooling":
      return ["cool", "fan", "dry"];
  }
}
