import type { z } from "zod";
import { err, type Result } from "../core/result";

/**
 * Why a value or payload does not fit a DPT. The message names the DPT and the
 * limit it broke, e.g. "9.001: 700000 is above the maximum 670433.28".
 */
export interface DptError {
  readonly kind: "dpt.out-of-range" | "dpt.wrong-type" | "dpt.payload-length";
  readonly dpt: string;
  readonly message: string;
}

/**
 * One datapoint type: how a value of type `V` travels on the bus and how it is shown.
 *
 * Payload convention: when `sizeBits` <= 6 the payload is ONE byte holding the value
 * in its low bits (the frame packs it into the APCI octet); otherwise exactly
 * ceil(sizeBits / 8) bytes, most significant first.
 *
 * encode/decode never throw and validate their input cheaply (no zod on the hot
 * path); `valueSchema` is for JSON from outside (scenarios, the console).
 */
export interface DptCodec<V> {
  /** DPT id, main.sub with a three-digit sub number: "9.001". */
  readonly id: string;
  /** Short human name, e.g. "temperature". */
  readonly name: string;
  /** Unit shown after the value ("°C", "%"); "" when the value has none. */
  readonly unit: string;
  readonly sizeBits: number;
  /** Smallest and largest value for numeric DPTs, in `unit`. */
  readonly min?: number;
  readonly max?: number;
  readonly valueSchema: z.ZodType<V>;
  encode(value: V): Result<Uint8Array, DptError>;
  decode(payload: Uint8Array): Result<V, DptError>;
  /** Value with its unit for people: "21.00 °C", "On", "scene 3". */
  format(value: V): string;
}

/** Bytes a payload of this size has under the payload convention. */
export function payloadOctets(sizeBits: number): number {
  return sizeBits <= 6 ? 1 : Math.ceil(sizeBits / 8);
}

export function outOfRange(
  dpt: string,
  message: string,
): { readonly ok: false; readonly error: DptError } {
  return err({ kind: "dpt.out-of-range", dpt, message: `${dpt}: ${message}` });
}

export function wrongType(
  dpt: string,
  expected: string,
  value: unknown,
): { readonly ok: false; readonly error: DptError } {
  return err({
    kind: "dpt.wrong-type",
    dpt,
    message: `${dpt}: expected ${expected}, got ${describe(value)}`,
  });
}

export function wrongLength(
  dpt: string,
  expected: number,
  payload: Uint8Array,
): { readonly ok: false; readonly error: DptError } {
  return err({
    kind: "dpt.payload-length",
    dpt,
    message: `${dpt}: payload must be ${expected} byte${expected === 1 ? "" : "s"}, got ${payload.length}`,
  });
}

/**
 * "<value> is below/above the limit" for the DPT. Kept out of line on purpose: a
 * template literal inside a codec's hot function, even on a branch never taken, made
 * V8 compile that function 30-40x slower (measured with npm run bench:codec).
 */
export function beyondLimits(
  dpt: string,
  value: number,
  min: number,
  max: number,
  unit: string,
  prefix = "",
): { readonly ok: false; readonly error: DptError } {
  const limit = value < min ? `below the minimum ${min}` : `above the maximum ${max}`;
  return outOfRange(dpt, `${prefix}${value} is ${withUnit(limit, unit)}`);
}

/** Payload bits above the datapoint's size are set: the bytes are not a value of this DPT. */
export function strayBits(
  dpt: string,
  sizeBits: number,
  octet: number,
): { readonly ok: false; readonly error: DptError } {
  return outOfRange(
    dpt,
    `payload 0x${octet.toString(16).toUpperCase().padStart(2, "0")} has bits set above its ${sizeBits} bit${sizeBits === 1 ? "" : "s"}`,
  );
}

function describe(value: unknown): string {
  if (value === null) return "null";
  if (typeof value === "string")
    return `string ${JSON.stringify(value.length > 20 ? value.slice(0, 20) + "…" : value)}`;
  if (typeof value === "number" || typeof value === "boolean")
    return `${typeof value} ${String(value)}`;
  return typeof value;
}

/** Number with `unit` after a space, or alone when the DPT has no unit. */
export function withUnit(text: string, unit: string): string {
  return unit === "" ? text : `${text} ${unit}`;
}

/** Compact decimal for display: at most `digits` decimals, trailing zeros dropped. */
export function trimDecimals(value: number, digits: number): string {
  return String(Number(value.toFixed(digits)));
}
