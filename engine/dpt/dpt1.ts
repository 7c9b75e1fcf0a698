import { z } from "zod";
import { ok } from "../core/result";
import { strayBits, wrongLength, wrongType, type DptCodec } from "./dpt-codec";

/** A 1-bit DPT (DPT spec §3.1): false travels as 0, true as 1. */
function dpt1(id: string, name: string, whenFalse: string, whenTrue: string): DptCodec<boolean> {
  return {
    id,
    name,
    unit: "",
    sizeBits: 1,
    valueSchema: z.boolean(),
    encode(value) {
      if (typeof value !== "boolean") return wrongType(id, "a boolean", value);
      const payload = new Uint8Array(1);
      payload[0] = value ? 1 : 0;
      return ok(payload);
    },
    decode(payload) {
      if (payload.length !== 1) return wrongLength(id, 1, payload);
      const octet = payload[0] as number;
      if (octet > 1) return strayBits(id, 1, octet);
      return ok(octet === 1);
    },
    format: (value) => (value ? whenTrue : whenFalse),
  };
}

export const dpt1Codecs: readonly DptCodec<boolean>[] = [
  dpt1("1.001", "switch", "Off", "On"),
  dpt1("1.002", "boolean", "False", "True"),
  dpt1("1.003", "enable", "Disable", "Enable"),
  dpt1("1.005", "alarm", "No alarm", "Alarm"),
  // DPT spec §3.1 (1.015 reset): 0 no action, 1 reset (from memory of the spec's table).
  dpt1("1.015", "reset", "No action", "Reset"),
  dpt1("1.008", "up/down", "Up", "Down"),
  dpt1("1.009", "open/close", "Open", "Close"),
  dpt1("1.018", "occupancy", "Not occupied", "Occupied"),
  dpt1("1.019", "window/door", "Closed", "Open"),
  // DPT spec §4.2: 0 = cooling, 1 = heating.
  dpt1("1.100", "heat/cool", "Cooling", "Heating"),
];
