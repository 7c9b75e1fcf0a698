import { z } from "zod";
import { ok } from "../core/result";
import { beyondLimits, withUnit, wrongLength, wrongType, type DptCodec } from "./dpt-codec";

export interface IntegerDptSpec {
  readonly id: string;
  readonly name: string;
  readonly unit: string;
  /** 1, 2 or 4 octets, most significant first. */
  readonly octets: 1 | 2 | 4;
  readonly signed: boolean;
  /** Narrower range than the octets allow (e.g. a fan stage), in the same integer units. */
  readonly min?: number;
  readonly max?: number;
}

/**
 * An integer DPT (5.x unscaled, 6.x, 7.x, 8.x, 12.x, 13.x; DPT spec §3.5-3.8, §3.14-3.15):
 * unsigned or two's complement, big-endian.
 */
export function integerDpt(spec: IntegerDptSpec): DptCodec<number> {
  const { id, octets, signed } = spec;
  const bits = octets * 8;
  const min = spec.min ?? (signed ? -(2 ** (bits - 1)) : 0);
  const max = spec.max ?? (signed ? 2 ** (bits - 1) - 1 : 2 ** bits - 1);
  return {
    id,
    name: spec.name,
    unit: spec.unit,
    sizeBits: bits,
    min,
    max,
    valueSchema: z.number().int().min(min).max(max),
    encode(value) {
      if (typeof value !== "number") return wrongType(id, "an integer", value);
      if (!Number.isInteger(value)) return wrongType(id, "an integer", value);
      if (value < min || value > max) return beyondLimits(id, value, min, max, spec.unit);
      const payload = new Uint8Array(octets);
      // `>>>` and `&` work on the 32-bit two's complement, which is the wire form.
      for (let i = octets - 1, v = value; i >= 0; i--, v = Math.floor(v / 256))
        payload[i] = v & 0xff;
      return ok(payload);
    },
    decode(payload) {
      if (payload.length !== octets) return wrongLength(id, octets, payload);
      let v = 0;
      for (let i = 0; i < octets; i++) v = v * 256 + (payload[i] as number);
      if (signed && v >= 2 ** (bits - 1)) v -= 2 ** bits;
      if (v < min || v > max) return beyondLimits(id, v, min, max, spec.unit);
      return ok(v);
    },
    format: (value) => withUnit(String(value), spec.unit),
  };
}
