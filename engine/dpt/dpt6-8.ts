import type { DptCodec } from "./dpt-codec";
import { integerDpt } from "./integer-codec";

/** 1- and 2-octet integers (DPT spec §3.6 6.x signed 8 bit, §3.7 7.x unsigned 16, §3.8 8.x signed 16). */
export const dpt6To8Codecs: readonly DptCodec<number>[] = [
  integerDpt({ id: "6.001", name: "percentage (-128..127)", unit: "%", octets: 1, signed: true }),
  integerDpt({ id: "6.010", name: "counter pulses", unit: "pulses", octets: 1, signed: true }),
  integerDpt({ id: "7.001", name: "pulses", unit: "pulses", octets: 2, signed: false }),
  integerDpt({ id: "7.012", name: "current", unit: "mA", octets: 2, signed: false }),
  integerDpt({ id: "8.001", name: "pulses difference", unit: "pulses", octets: 2, signed: true }),
];
