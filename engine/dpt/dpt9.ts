import { z } from "zod";
import { ok, type Result } from "../core/result";
import { beyondLimits, wrongLength, wrongType, type DptCodec, type DptError } from "./dpt-codec";

/*
 * DPT 9.x, the 2-octet float (DPT spec §3.10):
 *
 *   bits, MSB first: M EEEE MMMMMMMMMMM      value = 0.01 · M · 2^E
 *
 * M is a 12-bit two's-complement mantissa (-2048..2047) whose sign bit is bit 15,
 * E is 0..15. 0x7FFF means "invalid data" and decodes to DPT9_INVALID, never a number.
 *
 * Encoding rule (the spec leaves rounding open, so Benchline states its own):
 *   1. Take the value in hundredths, s = value · 100. If s lies within 1e-6 of a whole
 *      number it is taken as that number: this absorbs binary noise in decimal inputs
 *      (0.29 · 100 = 28.999999999999996) and is far below the format's resolution.
 *   2. For E = 0, 1, … 15 take M = round(s / 2^E), rounding half away from zero
 *      (1024.5 -> 1025, -1024.5 -> -1025), and use the first E where M fits -2048..2047.
 * So encodings are canonical (smallest exponent) and the encoder is monotonic.
 *
 * Range: -671088.64 (0xF800) .. 670433.28 (0x7FFE) per v02.02.01; an input outside it
 * is refused before rounding, not clamped. Older spec versions quoted 670760.96 as the
 * top, which is 0x7FFF, the invalid marker, so it cannot be a value.
 */

/** The "invalid data" marker 0x7FFF decodes to (and encodes from). */
export interface DptInvalid {
  readonly invalid: true;
}

/** The one invalid-data value; decode returns this very object for 0x7FFF. */
export const DPT9_INVALID: DptInvalid = Object.freeze({ invalid: true as const });

/** True for the invalid-data marker of DPT 9.x (any `{ invalid: true }`, e.g. from JSON). */
export function isDptInvalid(value: unknown): value is DptInvalid {
  return (
    typeof value === "object" && value !== null && (value as { invalid?: unknown }).invalid === true
  );
}

/** A DPT 9.x value: a number in the DPT's unit, or the invalid-data marker. */
export type Dpt9Value = number | DptInvalid;

/** Largest encodable value, 0x7FFE (DPT spec §3.10, v02.02.01). */
export const DPT9_MAX = 670433.28;
/** Smallest encodable value, 0xF800. */
export const DPT9_MIN = -671088.64;
/** Raw pattern for "invalid data". */
export const DPT9_INVALID_RAW = 0x7fff;

/**
 * Encodes a finite number already known to lie in DPT9_MIN..DPT9_MAX into the raw
 * 16-bit pattern, following the rule above.
 */
export function encodeFloat16Raw(value: number): number {
  let s = value * 100;
  let m = Math.round(s);
  if (s - m < 1e-6 && m - s < 1e-6)
    s = m; // on the 0.01 grid: m is already the mantissa at E=0
  else m = s < 0 ? -Math.round(-s) : Math.round(s);
  let e = 0;
  if (m > 2047 || m < -2048) {
    // |m| has `bits` bits, so no exponent below bits - 12 can fit; start there (at least 1)
    // and step up: at most two steps, instead of trying every exponent from 0.
    e = 20 - Math.clz32(m < 0 ? -m : m);
    if (e < 1) e = 1;
    for (;;) {
      const scaled = s / (1 << e); // exact: division by a power of two
      m = scaled < 0 ? -Math.round(-scaled) : Math.round(scaled);
      if (m <= 2047 && m >= -2048) break;
      e++;
    }
  }
  return (m < 0 ? 0x8000 : 0) | (e << 11) | (m & 0x7ff);
}

/** Decodes a raw 16-bit pattern other than 0x7FFF to its number. */
export function decodeFloat16Raw(raw: number): number {
  const m = (raw & 0x7ff) - (raw & 0x8000 ? 2048 : 0);
  // m · 2^E is an exact integer; one division by 100 gives the nearest double to the
  // true value (multiplying by 0.01 would add a second rounding).
  return (m * (1 << ((raw >>> 11) & 0x0f))) / 100;
}

interface Dpt9Spec {
  readonly id: string;
  readonly name: string;
  readonly unit: string;
  readonly min: number;
  readonly max?: number;
}

function dpt9(spec: Dpt9Spec): DptCodec<Dpt9Value> {
  const { id, unit, min } = spec;
  const max = spec.max ?? DPT9_MAX;
  return {
    id,
    name: spec.name,
    unit,
    sizeBits: 16,
    min,
    max,
    valueSchema: z.union([z.number().min(min).max(max), z.object({ invalid: z.literal(true) })]),
    encode(value): Result<Uint8Array, DptError> {
      let raw: number;
      if (typeof value === "number") {
        // `value >= min && value <= max` is false for NaN too.
        if (!(value >= min && value <= max)) {
          if (value !== value) return wrongType(id, "a number or { invalid: true }", value);
          return beyondLimits(id, value, min, max, unit);
        }
        raw = encodeFloat16Raw(value);
      } else if (isDptInvalid(value)) {
        raw = DPT9_INVALID_RAW;
      } else {
        return wrongType(id, "a number or { invalid: true }", value);
      }
      const payload = new Uint8Array(2);
      payload[0] = raw >>> 8;
      payload[1] = raw & 0xff;
      return ok(payload);
    },
    decode(payload): Result<Dpt9Value, DptError> {
      if (payload.length !== 2) return wrongLength(id, 2, payload);
      const raw = ((payload[0] as number) << 8) | (payload[1] as number);
      if (raw === DPT9_INVALID_RAW) return ok(DPT9_INVALID);
      const value = decodeFloat16Raw(raw);
      // A pattern outside this subtype's range (e.g. -300 °C) is not a value of it.
      if (value < min || value > max) return beyondLimits(id, value, min, max, unit, "decoded ");
      return ok(value);
    },
    format: (value) => (typeof value === "number" ? `${value.toFixed(2)} ${unit}` : "invalid"),
  };
}

// Subtype ranges: 9.001 bottom -273 °C (knx-reference.md). The zero bottoms of the
// physical quantities that cannot be negative (lux, wind speed, pressure, humidity,
// air quality) are recalled from memory of the DPT spec §3.10 table, not from the
// reference file.
export const dpt9Codecs: readonly DptCodec<Dpt9Value>[] = [
  dpt9({ id: "9.001", name: "temperature", unit: "°C", min: -273 }),
  dpt9({ id: "9.002", name: "temperature difference", unit: "K", min: DPT9_MIN }),
  dpt9({ id: "9.003", name: "kelvin per hour", unit: "K/h", min: DPT9_MIN }),
  dpt9({ id: "9.004", name: "illuminance", unit: "lx", min: 0 }),
  dpt9({ id: "9.005", name: "wind speed", unit: "m/s", min: 0 }),
  dpt9({ id: "9.006", name: "pressure", unit: "Pa", min: 0 }),
  dpt9({ id: "9.007", name: "humidity", unit: "%", min: 0 }),
  dpt9({ id: "9.008", name: "air quality", unit: "ppm", min: 0 }),
  dpt9({ id: "9.020", name: "voltage", unit: "mV", min: DPT9_MIN }),
  dpt9({ id: "9.021", name: "current", unit: "mA", min: DPT9_MIN }),
  dpt9({ id: "9.024", name: "power", unit: "kW", min: DPT9_MIN }),
  dpt9({ id: "9.025", name: "volume flow", unit: "l/h", min: DPT9_MIN }),
];
