/** How finely a virtual time is printed: milliseconds (the default) or microseconds. */
export type VirtualTimePrecision = "ms" | "us";

export interface VirtualTimeFormat {
  readonly precision?: VirtualTimePrecision;
}

const US_PER_MS = 1_000;
const US_PER_S = 1_000_000;
const US_PER_H = 3_600_000_000;
const US_PER_MIN = 60_000_000;

/**
 * A point in virtual time (integer µs since the simulation started) as a clock
 * reading, h:mm:ss.mmm ("3:00:01.020"), or h:mm:ss.mmmmmm when microseconds are
 * asked for. Always the same shape, so a column of times lines up and reads in
 * one unit whatever the values; sub-millisecond parts are cut, not rounded, as a
 * clock never shows a time that has not come yet.
 */
export function formatVirtualTime(timeUs: number, format: VirtualTimeFormat = {}): string {
  if (!Number.isInteger(timeUs) || timeUs < 0)
    throw new Error(`formatVirtualTime: ${timeUs} is not a non-negative integer of µs`);
  const hours = Math.floor(timeUs / US_PER_H);
  const minutes = Math.floor((timeUs % US_PER_H) / US_PER_MIN);
  const seconds = Math.floor((timeUs % US_PER_MIN) / US_PER_S);
  const fractionUs = timeUs % US_PER_S;
  const fraction =
    format.precision === "us"
      ? String(fractionUs).padStart(6, "0")
      : String(Math.floor(fractionUs / US_PER_MS)).padStart(3, "0");
  return `${hours}:${String(minutes).padStart(2, "0")}:${String(seconds).padStart(2, "0")}.${fraction}`;
}
