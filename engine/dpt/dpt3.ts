import { z } from "zod";
import { ok } from "../core/result";
import { outOfRange, strayBits, wrongLength, wrongType, type DptCodec } from "./dpt-codec";

/**
 * 3.007 dimming control (DPT spec §3.3): bit 3 direction (1 increase), bits 0-2 step
 * code; code 0 is stop, code n asks for a step of 100 / 2^(n-1) %.
 */
export interface DimmingControl {
  readonly increase: boolean;
  readonly stepCode: number;
}

export const dpt3007: DptCodec<DimmingControl> = {
  id: "3.007",
  name: "dimming control",
  unit: "",
  sizeBits: 4,
  valueSchema: z.object({ increase: z.boolean(), stepCode: z.number().int().min(0).max(7) }),
  encode(v) {
    if (
      typeof v !== "object" ||
      v === null ||
      typeof v.increase !== "boolean" ||
      typeof v.stepCode !== "number"
    ) {
      return wrongType("3.007", "{ increase: boolean, stepCode: 0..7 }", v);
    }
    const code = v.stepCode;
    if (!Number.isInteger(code) || code < 0 || code > 7) {
      return outOfRange("3.007", `stepCode ${code} is not an integer in 0..7`);
    }
    const payload = new Uint8Array(1);
    payload[0] = (v.increase ? 8 : 0) | code;
    return ok(payload);
  },
  decode(payload) {
    if (payload.length !== 1) return wrongLength("3.007", 1, payload);
    const octet = payload[0] as number;
    if (octet > 15) return strayBits("3.007", 4, octet);
    return ok({ increase: (octet & 8) !== 0, stepCode: octet & 7 });
  },
  format(v) {
    if (v.stepCode === 0) return "Stop";
    return `${v.increase ? "Increase" : "Decrease"} by ${100 / 2 ** (v.stepCode - 1)} %`;
  },
};
