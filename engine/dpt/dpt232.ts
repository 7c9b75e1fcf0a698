import { z } from "zod";
import { ok } from "../core/result";
import { outOfRange, wrongLength, wrongType, type DptCodec } from "./dpt-codec";

/** 232.600 RGB colour: three octets R, G, B, R first (DPT spec §3.x, knx-reference.md). */
export interface Rgb {
  readonly r: number;
  readonly g: number;
  readonly b: number;
}

const channel = z.number().int().min(0).max(255);
const isOctet = (n: unknown) => typeof n === "number" && Number.isInteger(n) && n >= 0 && n <= 255;

export const dpt232600: DptCodec<Rgb> = {
  id: "232.600",
  name: "RGB colour",
  unit: "",
  sizeBits: 24,
  valueSchema: z.object({ r: channel, g: channel, b: channel }),
  encode(v) {
    if (
      typeof v !== "object" ||
      v === null ||
      typeof v.r !== "number" ||
      typeof v.g !== "number" ||
      typeof v.b !== "number"
    ) {
      return wrongType("232.600", "{ r, g, b } numbers", v);
    }
    for (const key of ["r", "g", "b"] as const) {
      if (!isOctet(v[key]))
        return outOfRange("232.600", `${key} ${v[key]} is not an integer in 0..255`);
    }
    return ok(Uint8Array.of(v.r, v.g, v.b));
  },
  decode(payload) {
    if (payload.length !== 3) return wrongLength("232.600", 3, payload);
    return ok({ r: payload[0] as number, g: payload[1] as number, b: payload[2] as number });
  },
  format: (v) =>
    "#" + [v.r, v.g, v.b].map((c) => c.toString(16).toUpperCase().padStart(2, "0")).join(""),
};
