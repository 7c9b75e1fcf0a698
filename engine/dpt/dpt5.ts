import { z } from "zod";
import { ok } from "../core/result";
import {
  beyondLimits,
  trimDecimals,
  withUnit,
  wrongLength,
  wrongType,
  type DptCodec,
} from "./dpt-codec";
import { integerDpt } from "./integer-codec";

/**
 * A scaled 8-bit DPT (DPT spec §3.5): 0..`top` in the unit travels as 0..255.
 * Encoding rounds to the nearest step with halves up (value · 255 / top, then
 * Math.round), so 50 % -> 127.5 -> 0x80 as the spec's table says. Decoding gives the
 * exact step value raw · top / 255 (50.196… % for 0x80), so re-encoding is lossless;
 * `format` shows one decimal.
 */
function scaledDpt(id: string, name: string, unit: string, top: number): DptCodec<number> {
  return {
    id,
    name,
    unit,
    sizeBits: 8,
    min: 0,
    max: top,
    valueSchema: z.number().min(0).max(top),
    encode(value) {
      if (typeof value !== "number" || value !== value) return wrongType(id, "a number", value);
      if (value < 0 || value > top) return beyondLimits(id, value, 0, top, unit);
      const payload = new Uint8Array(1);
      payload[0] = Math.round((value * 255) / top);
      return ok(payload);
    },
    decode(payload) {
      if (payload.length !== 1) return wrongLength(id, 1, payload);
      return ok(((payload[0] as number) * top) / 255);
    },
    format: (value) => withUnit(trimDecimals(value, 1), unit),
  };
}

export const dpt5Codecs: readonly DptCodec<number>[] = [
  scaledDpt("5.001", "percentage", "%", 100),
  scaledDpt("5.003", "angle", "°", 360),
  integerDpt({ id: "5.004", name: "percentage (0..255)", unit: "%", octets: 1, signed: false }),
  integerDpt({ id: "5.010", name: "counter pulses", unit: "pulses", octets: 1, signed: false }),
  // Fan stage: 0..255 in libraries; not in the v02.02.01 overview (knx-reference.md).
  integerDpt({ id: "5.100", name: "fan stage", unit: "", octets: 1, signed: false }),
];
