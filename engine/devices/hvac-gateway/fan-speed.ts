import { z } from "zod";

/**
 * How the gateway carries the fan speed on KNX. Common practice, no published
 * source for the mapping between them; the DPTs are the standard's:
 * - "level" (DPT 5.100, fan stage): 1..fanLevels, and 0 = automatic when the
 *   gateway offers it. 0 as automatic is Benchline's older convention, kept so
 *   existing benches behave as before; it is not a meaning the standard gives.
 * - "counter" (DPT 5.010, counter pulses, DPT spec §3.6): the level number 1..fanLevels.
 * - "percent" (DPT 5.001, scaling, DPT spec §3.5): levels share 0..100 % evenly.
 *   A command of p % selects level ceil((raw − ½) · n / 255) from the raw octet
 *   (raw = p · 255 / 100), so for 3 levels 0.4..33.3 % is level 1, 33.7..66.7 %
 *   level 2, 67.1..100 % level 3; the status of level k is k · 100 / n %
 *   (33.3, 66.7, 100 for 3 levels), which reads back as the same level.
 */
export const fanEncodingSchema = z.enum(["level", "counter", "percent"]);
export type FanEncoding = z.infer<typeof fanEncodingSchema>;

export const FAN_DPT: Readonly<Record<FanEncoding, string>> = {
  level: "5.100",
  counter: "5.010",
  percent: "5.001",
};

/** The raw octet of a 5.001 percentage (DPT spec §3.5: 0..100 % on 0..255, rounded). */
const rawOfPercent = (percent: number) => Math.round((percent * 255) / 100);

/**
 * The fan level a KNX value asks for, before clamping to the unit's levels: 0
 * means "no level" (the caller decides whether that is automatic or refused).
 */
export function fanLevelFromKnx(value: number, encoding: FanEncoding, levels: number): number {
  // The half octet absorbs the rounding of a status value k · 100 / n %, so it reads back as k.
  if (encoding === "percent")
    return Math.max(0, Math.ceil(((rawOfPercent(value) - 0.5) * levels) / 255));
  return Math.round(value);
}

/** The value the fan status object sends for a unit level (0 = automatic). */
export function fanStatusToKnx(level: number, encoding: FanEncoding, levels: number): number {
  const clamped = Math.min(level, levels);
  if (encoding === "percent") return (clamped * 100) / levels;
  return clamped;
}
