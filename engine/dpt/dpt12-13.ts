import type { DptCodec } from "./dpt-codec";
import { integerDpt } from "./integer-codec";

/** 4-octet integers (DPT spec §3.14 12.x unsigned, §3.15 13.x two's complement). */
export const dpt12And13Codecs: readonly DptCodec<number>[] = [
  integerDpt({
    id: "12.001",
    name: "counter pulses (unsigned)",
    unit: "pulses",
    octets: 4,
    signed: false,
  }),
  integerDpt({
    id: "13.001",
    name: "counter pulses (signed)",
    unit: "pulses",
    octets: 4,
    signed: true,
  }),
  integerDpt({ id: "13.010", name: "active energy", unit: "Wh", octets: 4, signed: true }),
];
