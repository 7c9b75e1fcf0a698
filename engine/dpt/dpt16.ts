import { z } from "zod";
import { ok } from "../core/result";
import { outOfRange, wrongLength, wrongType, type DptCodec } from "./dpt-codec";

const OCTETS = 14;

/**
 * DPT 16.x, a string of up to 14 characters padded with 0x00 (DPT spec §3.16):
 * 16.000 ASCII (0x01..0x7F), 16.001 ISO 8859-1 (0x01..0xFF, the same code points in
 * JavaScript strings). NUL is the padding, so it cannot appear inside the text, and
 * decoding refuses non-zero octets after the padding starts.
 */
function dpt16(id: string, name: string, highest: number): DptCodec<string> {
  const charset = highest === 0x7f ? "ASCII" : "ISO 8859-1";
  return {
    id,
    name,
    unit: "",
    sizeBits: OCTETS * 8,
    valueSchema: z
      .string()
      .max(OCTETS)
      .refine((s) => [...s].every((c) => c.charCodeAt(0) >= 1 && c.charCodeAt(0) <= highest), {
        message: `${id}: only ${charset} characters without NUL`,
      }),
    encode(value) {
      if (typeof value !== "string") return wrongType(id, "a string", value);
      if (value.length > OCTETS)
        return outOfRange(id, `text has ${value.length} characters, the limit is 14`);
      const payload = new Uint8Array(OCTETS);
      for (let i = 0; i < value.length; i++) {
        const code = value.charCodeAt(i);
        if (code < 1 || code > highest) {
          return outOfRange(
            id,
            `character ${JSON.stringify(value[i])} at ${i} is not ${charset} without NUL`,
          );
        }
        payload[i] = code;
      }
      return ok(payload);
    },
    decode(payload) {
      if (payload.length !== OCTETS) return wrongLength(id, OCTETS, payload);
      let text = "";
      let i = 0;
      for (; i < OCTETS && payload[i] !== 0; i++) {
        const code = payload[i] as number;
        if (code > highest)
          return outOfRange(
            id,
            `octet 0x${code.toString(16).toUpperCase()} at ${i} is not ${charset}`,
          );
        text += String.fromCharCode(code);
      }
      for (; i < OCTETS; i++) {
        if (payload[i] !== 0)
          return outOfRange(id, `octet at ${i} follows the 0x00 padding but is not 0x00`);
      }
      return ok(text);
    },
    format: (value) => JSON.stringify(value),
  };
}

export const dpt16Codecs: readonly DptCodec<string>[] = [
  dpt16("16.000", "text (ASCII)", 0x7f),
  dpt16("16.001", "text (ISO 8859-1)", 0xff),
];
