import { err, ok, type Result } from "../core/result";

/** Why a duration text was refused. */
export interface DurationError {
  readonly kind: "duration.invalid";
  readonly input: string;
  readonly message: string;
}

const UNIT_US: Readonly<Record<string, number>> = {
  us: 1,
  µs: 1,
  ms: 1_000,
  s: 1_000_000,
  m: 60_000_000,
  h: 3_600_000_000,
};

// One or more "<number><unit>" parts, e.g. "500ms", "1.5s", "1m30s".
const PART = /(\d+(?:\.\d+)?)(us|µs|ms|s|m|h)/y;

/** Longest duration a scenario may name: 24 h of virtual time, far beyond any test but safe in a double. */
export const MAX_DURATION_US = 24 * 3_600_000_000;

/**
 * Parses a readable duration ("500ms", "30s", "2m", "1h", "1m30s", "250us") into
 * integer microseconds of virtual time. Fractions are allowed as long as the
 * result is a whole number of microseconds ("1.5s" yes, "0.5us" no).
 */
export function parseDuration(text: string): Result<number, DurationError> {
  const input = text.trim();
  const fail = (why: string) =>
    err<DurationError>({
      kind: "duration.invalid",
      input: text,
      message: `expected a duration like "500ms", "30s", "2m" or "1h", got ${JSON.stringify(text)}${why ? ` (${why})` : ""}`,
    });
  if (input.length === 0) return fail("");
  let totalUs = 0;
  let index = 0;
  while (index < input.length) {
    PART.lastIndex = index;
    const match = PART.exec(input);
    if (!match) return fail("");
    const amount = Number(match[1]);
    const unit = UNIT_US[match[2] ?? ""];
    if (unit === undefined) return fail("");
    totalUs += amount * unit;
    index = PART.lastIndex;
  }
  // Sum of decimal fractions can land a hair off an integer; accept only what rounds cleanly.
  const rounded = Math.round(totalUs);
  if (Math.abs(rounded - totalUs) > 1e-6) return fail("finer than one microsecond");
  if (rounded > MAX_DURATION_US) return fail("longer than 24h");
  return ok(rounded);
}

/** Formats integer microseconds as the shortest readable duration that parses back to the same value. */
export function formatDuration(us: number): string {
  if (!Number.isInteger(us) || us < 0)
    throw new Error(`formatDuration: ${us} is not a non-negative integer of µs`);
  if (us === 0) return "0ms";
  const units: readonly [string, number][] = [
    ["h", 3_600_000_000],
    ["m", 60_000_000],
    ["s", 1_000_000],
    ["ms", 1_000],
    ["us", 1],
  ];
  for (const [unit, size] of units) if (us % size === 0) return `${us / size}${unit}`;
  return `${us}us`;
}
