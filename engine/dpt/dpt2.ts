import { z } from "zod";
import { ok } from "../core/result";
import { strayBits, wrongLength, wrongType, type DptCodec } from "./dpt-codec";

/** 2.001 switch control: bit 1 control (priority), bit 0 value (DPT spec §3.2). */
export interface SwitchControl {
  readonly control: boolean;
  readonly value: boolean;
}

const schema = z.object({ control: z.boolean(), value: z.boolean() });

export const dpt2001: DptCodec<SwitchControl> = {
  id: "2.001",
  name: "switch control",
  unit: "",
  sizeBits: 2,
  valueSchema: schema,
  encode(v) {
    if (
      typeof v !== "object" ||
      v === null ||
      typeof v.control !== "boolean" ||
      typeof v.value !== "boolean"
    ) {
      return wrongType("2.001", "{ control: boolean, value: boolean }", v);
    }
    const payload = new Uint8Array(1);
    payload[0] = (v.control ? 2 : 0) | (v.value ? 1 : 0);
    return ok(payload);
  },
  decode(payload) {
    if (payload.length !== 1) return wrongLength("2.001", 1, payload);
    const octet = payload[0] as number;
    if (octet > 3) return strayBits("2.001", 2, octet);
    return ok({ control: (octet & 2) !== 0, value: (octet & 1) !== 0 });
  },
  format: (v) =>
    v.control ? `Control ${v.value ? "On" : "Off"}` : `No control (${v.value ? "On" : "Off"})`,
};
