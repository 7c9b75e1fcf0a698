import { z } from "zod";
import { ok } from "../core/result";
import { outOfRange, wrongLength, wrongType, type DptCodec } from "./dpt-codec";

/** Largest finite IEEE 754 single. */
const FLOAT32_MAX = 3.4028234663852886e38;

// One scratch view for the conversions, so encode and decode allocate only the payload.
const scratch = new DataView(new ArrayBuffer(4));

// Error texts are built out of line: a template literal inside encode/decode slows V8's
// compiled code even when its branch is never taken (see beyondLimits in dpt-codec.ts).
function beyondSingle(id: string, value: number) {
  return outOfRange(id, `${value} is beyond ±${FLOAT32_MAX}, the largest single-precision float`);
}
function notFinite(id: string, value: number) {
  return outOfRange(id, `payload is ${value}, not a finite number`);
}

/**
 * DPT 14.x, IEEE 754 single precision, big-endian (DPT spec §3.17). Values are
 * rounded to the nearest single (Math.fround); NaN and infinities are refused both
 * ways because a bench value must be a finite number.
 */
function dpt14(id: string, name: string, unit: string): DptCodec<number> {
  return {
    id,
    name,
    unit,
    sizeBits: 32,
    min: -FLOAT32_MAX,
    max: FLOAT32_MAX,
    valueSchema: z.number().min(-FLOAT32_MAX).max(FLOAT32_MAX),
    encode(value) {
      if (typeof value !== "number" || value !== value) return wrongType(id, "a number", value);
      if (value > FLOAT32_MAX || value < -FLOAT32_MAX) return beyondSingle(id, value);
      scratch.setFloat32(0, value);
      const payload = new Uint8Array(4);
      payload[0] = scratch.getUint8(0);
      payload[1] = scratch.getUint8(1);
      payload[2] = scratch.getUint8(2);
      payload[3] = scratch.getUint8(3);
      return ok(payload);
    },
    decode(payload) {
      if (payload.length !== 4) return wrongLength(id, 4, payload);
      scratch.setUint8(0, payload[0] as number);
      scratch.setUint8(1, payload[1] as number);
      scratch.setUint8(2, payload[2] as number);
      scratch.setUint8(3, payload[3] as number);
      const value = scratch.getFloat32(0);
      if (!Number.isFinite(value)) return notFinite(id, value);
      return ok(value);
    },
    // Seven significant digits: what a single carries.
    format: (value) => `${Number(value.toPrecision(7))} ${unit}`,
  };
}

export const dpt14Codecs: readonly DptCodec<number>[] = [
  dpt14("14.007", "angle", "°"),
  dpt14("14.019", "electric current", "A"),
  dpt14("14.027", "electric potential", "V"),
  dpt14("14.031", "energy", "J"),
  dpt14("14.033", "frequency", "Hz"),
  dpt14("14.056", "power", "W"),
  dpt14("14.057", "power factor", "cos φ"),
  dpt14("14.065", "speed", "m/s"),
  dpt14("14.068", "temperature", "°C"),
  dpt14("14.069", "absolute temperature", "K"),
  dpt14("14.070", "temperature difference", "K"),
  dpt14("14.076", "volume", "m³"),
  dpt14("14.077", "volume flux", "m³/s"),
];
