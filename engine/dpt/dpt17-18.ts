import { z } from "zod";
import { ok } from "../core/result";
import { outOfRange, strayBits, wrongLength, wrongType, type DptCodec } from "./dpt-codec";

/*
 * Scenes (DPT spec §3.18 17.001, §3.19 18.001): scenes 1..64 travel as 0..63 and are
 * shown to people as 1..64, so values here are 1..64.
 */

function sceneError(id: string, scene: unknown) {
  return outOfRange(id, `scene ${String(scene)} is not an integer in 1..64`);
}

const isScene = (n: number) => Number.isInteger(n) && n >= 1 && n <= 64;

export const dpt17001: DptCodec<number> = {
  id: "17.001",
  name: "scene number",
  unit: "",
  sizeBits: 8,
  min: 1,
  max: 64,
  valueSchema: z.number().int().min(1).max(64),
  encode(value) {
    if (typeof value !== "number") return wrongType("17.001", "a scene number 1..64", value);
    if (!isScene(value)) return sceneError("17.001", value);
    const payload = new Uint8Array(1);
    payload[0] = value - 1;
    return ok(payload);
  },
  decode(payload) {
    if (payload.length !== 1) return wrongLength("17.001", 1, payload);
    const octet = payload[0] as number;
    // Bits 7 and 6 are reserved (0).
    if (octet > 63) return strayBits("17.001", 6, octet);
    return ok(octet + 1);
  },
  format: (value) => `Scene ${value}`,
};

/** 18.001 scene control: bit 7 learn (1) or recall (0), bit 6 reserved 0, bits 0-5 scene - 1. */
export interface SceneControl {
  readonly learn: boolean;
  readonly scene: number;
}

export const dpt18001: DptCodec<SceneControl> = {
  id: "18.001",
  name: "scene control",
  unit: "",
  sizeBits: 8,
  valueSchema: z.object({ learn: z.boolean(), scene: z.number().int().min(1).max(64) }),
  encode(v) {
    if (
      typeof v !== "object" ||
      v === null ||
      typeof v.learn !== "boolean" ||
      typeof v.scene !== "number"
    ) {
      return wrongType("18.001", "{ learn: boolean, scene: 1..64 }", v);
    }
    if (!isScene(v.scene)) return sceneError("18.001", v.scene);
    const payload = new Uint8Array(1);
    payload[0] = (v.learn ? 0x80 : 0) | (v.scene - 1);
    return ok(payload);
  },
  decode(payload) {
    if (payload.length !== 1) return wrongLength("18.001", 1, payload);
    const octet = payload[0] as number;
    if (octet & 0x40)
      return outOfRange(
        "18.001",
        `payload 0x${octet.toString(16).toUpperCase()} sets reserved bit 6`,
      );
    return ok({ learn: (octet & 0x80) !== 0, scene: (octet & 0x3f) + 1 });
  },
  format: (v) => `${v.learn ? "Learn" : "Recall"} scene ${v.scene}`,
};
