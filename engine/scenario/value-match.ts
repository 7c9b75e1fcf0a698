import type { DptCodec } from "../dpt";

/**
 * Whether an observed value matches an expected one: deep equality, with
 * numbers allowed to differ by `tolerance` (for floats such as DPT 9.001).
 */
export function valuesMatch(expected: unknown, actual: unknown, tolerance = 0): boolean {
  if (typeof expected === "number" && typeof actual === "number") {
    return expected === actual || Math.abs(expected - actual) <= tolerance + 1e-9;
  }
  if (
    expected === null ||
    actual === null ||
    typeof expected !== "object" ||
    typeof actual !== "object"
  ) {
    return Object.is(expected, actual);
  }
  if (Array.isArray(expected) !== Array.isArray(actual)) return false;
  const expectedKeys = Object.keys(expected);
  const actualKeys = Object.keys(actual);
  if (expectedKeys.length !== actualKeys.length) return false;
  return expectedKeys.every((key) =>
    valuesMatch(
      (expected as Record<string, unknown>)[key],
      (actual as Record<string, unknown>)[key],
      tolerance,
    ),
  );
}

/** A value for a verdict: the DPT's own formatting when it has one, JSON otherwise. */
export function formatValue(value: unknown, codec?: DptCodec<unknown>): string {
  if (value === undefined) return "nothing";
  if (codec !== undefined) {
    const checked = codec.valueSchema.safeParse(value);
    if (checked.success) return `${codec.format(checked.data)} (${JSON.stringify(value)})`;
  }
  return JSON.stringify(value) ?? String(value);
}

/** Reads a dotted path ("unit.setpointC", "presses.0") from a state value; undefined when any part is missing. */
export function valueAtPath(root: unknown, path: string): { found: boolean; value: unknown } {
  let current = root;
  for (const part of path.split(".")) {
    if (current === null || typeof current !== "object" || !(part in (current as object)))
      return { found: false, value: undefined };
    current = (current as Record<string, unknown>)[part];
  }
  return { found: true, value: current };
}
