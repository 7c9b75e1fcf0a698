import { z } from "zod";
import { validationError } from "./errors";

/**
 * The one schema for every name a person gives something (bench, scenario,
 * suite, lab title, a member's display name): trimmed, not empty, bounded,
 * and free of characters that make a name look like something else or break
 * what stores and shows it: control characters (NUL included), unpaired
 * surrogates (not text at all), and the bidirectional controls that reorder
 * what a reader sees ("trojan source" spoofing: U+202A-U+202E, U+2066-U+2069,
 * U+200E, U+200F, U+061C).
 */

// Checked code unit by code unit in one pass: a lone surrogate is a high one
// not followed by a low one, or a low one not preceded by a high one.
export function unsafeCharacterIn(value: string): string | null {
  for (let i = 0; i < value.length; i++) {
    const unit = value.charCodeAt(i);
    if (unit <= 0x1f || (unit >= 0x7f && unit <= 0x9f)) return `the control character ${hex(unit)}`;
    if (
      (unit >= 0x202a && unit <= 0x202e) ||
      (unit >= 0x2066 && unit <= 0x2069) ||
      unit === 0x200e ||
      unit === 0x200f ||
      unit === 0x061c
    ) {
      return `the bidirectional control ${hex(unit)}`;
    }
    if (unit >= 0xd800 && unit <= 0xdbff) {
      const next = value.charCodeAt(i + 1);
      if (next >= 0xdc00 && next <= 0xdfff) i++;
      else return `an unpaired surrogate ${hex(unit)}`;
    } else if (unit >= 0xdc00 && unit <= 0xdfff) {
      return `an unpaired surrogate ${hex(unit)}`;
    }
  }
  return null;
}

function hex(unit: number): string {
  return `U+${unit.toString(16).toUpperCase().padStart(4, "0")}`;
}

/**
 * A name schema: `what` reads "a bench name", `missing` is the message when
 * the name is absent or blank ("give the bench a name").
 */
export function nameSchema(what: string, missing: string, maxLength = 120) {
  return z
    .string({ error: missing })
    .trim()
    .min(1, missing)
    .max(maxLength, `${what} has at most ${maxLength} characters`)
    .superRefine((value, context) => {
      const unsafe = unsafeCharacterIn(value);
      if (unsafe)
        context.addIssue({ code: "custom", message: `${what} may not contain ${unsafe}` });
    });
}

/**
 * A name taken from somewhere other than a name field (a document's own name
 * used as the bench's), checked by the same schema; failures name `field`.
 */
export function checkedName(
  schema: ReturnType<typeof nameSchema>,
  value: unknown,
  field: readonly PropertyKey[],
): string {
  const parsed = schema.safeParse(value);
  if (!parsed.success) throw validationError(parsed.error, field);
  return parsed.data;
}
