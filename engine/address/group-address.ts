import { err, ok, type Result } from "../core/result";
import { addressError, type AddressError } from "./address-error";

/**
 * The three notations of a 16-bit group address (knx-reference.md, Addresses):
 * three-level main/middle/sub (0-31/0-7/0-255), two-level main/sub (0-31/0-2047)
 * and free (0-65535). All three spell the same raw number.
 */
export type GroupAddressStyle = "three-level" | "two-level" | "free";

/** Largest raw group or individual address (16 bits). */
export const MAX_RAW_ADDRESS = 0xffff;

// Digits only: no signs, no exponents, no hex; at most 5 so Number() stays exact.
const part = /^\d{1,5}$/;

/**
 * Parses a group address in any of the three notations, chosen by the number of
 * "/"-separated parts: "1/0/1" (three-level), "1/257" (two-level), "4097" (free).
 * Returns the raw 16-bit number. 0/0/0 is the broadcast address, not a group, and
 * is refused in every notation.
 */
export function parseGroupAddress(text: string): Result<number, AddressError> {
  const parts = text.trim().split("/");
  for (const p of parts) {
    if (!part.test(p)) {
      return err(
        addressError(text, `group address "${text}" must be numbers separated by "/", e.g. 1/0/1`),
      );
    }
  }
  const n = parts.map(Number);
  let raw: number;
  if (n.length === 3) {
    const [main, middle, sub] = n as [number, number, number];
    if (main > 31)
      return err(addressError(text, `group address "${text}": main group ${main} is above 31`));
    if (middle > 7)
      return err(addressError(text, `group address "${text}": middle group ${middle} is above 7`));
    if (sub > 255)
      return err(addressError(text, `group address "${text}": sub group ${sub} is above 255`));
    raw = (main << 11) | (middle << 8) | sub;
  } else if (n.length === 2) {
    const [main, sub] = n as [number, number];
    if (main > 31)
      return err(addressError(text, `group address "${text}": main group ${main} is above 31`));
    if (sub > 2047)
      return err(addressError(text, `group address "${text}": sub group ${sub} is above 2047`));
    raw = (main << 11) | sub;
  } else if (n.length === 1) {
    raw = n[0] as number;
    if (raw > MAX_RAW_ADDRESS) {
      return err(addressError(text, `group address "${text}" is above 65535`));
    }
  } else {
    return err(
      addressError(text, `group address "${text}" has ${n.length} parts; use 1/0/1, 1/257 or 4097`),
    );
  }
  if (raw === 0) {
    return err(
      addressError(text, `group address "${text}" is 0/0/0, the broadcast address, not a group`),
    );
  }
  return ok(raw);
}

/** Formats a raw 16-bit group address; three-level ("1/0/1") unless another style is asked for. */
export function formatGroupAddress(raw: number, style: GroupAddressStyle = "three-level"): string {
  assertRawAddress(raw, "group address");
  switch (style) {
    case "three-level":
      return `${raw >>> 11}/${(raw >>> 8) & 0x07}/${raw & 0xff}`;
    case "two-level":
      return `${raw >>> 11}/${raw & 0x7ff}`;
    case "free":
      return String(raw);
  }
}

/** True when `raw` is a 16-bit number usable as a group (not 0, the broadcast). */
export function isGroupAddressRaw(raw: number): boolean {
  return Number.isInteger(raw) && raw > 0 && raw <= MAX_RAW_ADDRESS;
}

/** A raw address outside 0..65535 inside the engine is a bug, not user input: it throws. */
export function assertRawAddress(raw: number, what: string): void {
  if (!Number.isInteger(raw) || raw < 0 || raw > MAX_RAW_ADDRESS) {
    throw new RangeError(`${what} raw value ${raw} is not an integer in 0..65535`);
  }
}
