import { z } from "zod";
import { ok } from "../core/result";
import { outOfRange, wrongLength, wrongType, type DptCodec } from "./dpt-codec";

/** An 8-bit enumeration (DPT spec §4.x, 20.x): values are the codes; reserved codes are refused. */
function enumDpt(
  id: string,
  name: string,
  table: Readonly<Record<number, string>>,
): DptCodec<number> {
  const codes = Object.keys(table).map(Number);
  const listed = codes.join(", ");
  return {
    id,
    name,
    unit: "",
    sizeBits: 8,
    min: Math.min(...codes),
    max: Math.max(...codes),
    valueSchema: z
      .number()
      .int()
      .refine((n) => n in table, { message: `${id}: code must be one of ${listed}` }),
    encode(value) {
      if (typeof value !== "number" || !Number.isInteger(value))
        return wrongType(id, "an integer code", value);
      if (table[value] === undefined)
        return outOfRange(id, `code ${value} is reserved; valid codes are ${listed}`);
      const payload = new Uint8Array(1);
      payload[0] = value;
      return ok(payload);
    },
    decode(payload) {
      if (payload.length !== 1) return wrongLength(id, 1, payload);
      const code = payload[0] as number;
      if (table[code] === undefined)
        return outOfRange(id, `code ${code} is reserved; valid codes are ${listed}`);
      return ok(code);
    },
    format: (value) => table[value] ?? `Reserved (${value})`,
  };
}

/** 20.102 HVAC mode (DPT spec §4.x, knx-reference.md). */
export const HVAC_MODES: Readonly<Record<number, string>> = {
  0: "Auto",
  1: "Comfort",
  2: "Standby",
  3: "Economy",
  4: "Building protection",
};

/** 20.105 HVAC controller mode, the full table (knx-reference.md); 18, 19 and 21..255 are reserved. */
export const HVAC_CONTROLLER_MODES: Readonly<Record<number, string>> = {
  0: "Auto",
  1: "Heat",
  2: "Morning warmup",
  3: "Cool",
  4: "Night purge",
  5: "Precool",
  6: "Off",
  7: "Test",
  8: "Emergency heat",
  9: "Fan only",
  10: "Free cool",
  11: "Ice",
  12: "Maximum heating",
  13: "Economic heat/cool",
  14: "Dehumidification",
  15: "Calibration",
  16: "Emergency cool",
  17: "Emergency steam",
  20: "NoDem",
};

export const dpt20Codecs: readonly DptCodec<number>[] = [
  enumDpt("20.102", "HVAC mode", HVAC_MODES),
  enumDpt("20.105", "HVAC controller mode", HVAC_CONTROLLER_MODES),
];
