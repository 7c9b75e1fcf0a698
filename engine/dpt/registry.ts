import type { DptCodec } from "./dpt-codec";
import { dpt1Codecs } from "./dpt1";
import { dpt2001 } from "./dpt2";
import { dpt3007 } from "./dpt3";
import { dpt5Codecs } from "./dpt5";
import { dpt6To8Codecs } from "./dpt6-8";
import { dpt9Codecs } from "./dpt9";
import { dpt12And13Codecs } from "./dpt12-13";
import { dpt14Codecs } from "./dpt14";
import { dpt16Codecs } from "./dpt16";
import { dpt17001, dpt18001 } from "./dpt17-18";
import { dpt20Codecs } from "./dpt20";
import { dpt232600 } from "./dpt232";

// Method parameters are bivariant in TypeScript, so each DptCodec<V> is a DptCodec<unknown>;
// encode still checks the value's type at run time, which is what makes that safe.
const all: readonly DptCodec<unknown>[] = [
  ...dpt1Codecs,
  dpt2001,
  dpt3007,
  ...dpt5Codecs,
  ...dpt6To8Codecs,
  ...dpt9Codecs,
  ...dpt12And13Codecs,
  ...dpt14Codecs,
  ...dpt16Codecs,
  dpt17001,
  dpt18001,
  ...dpt20Codecs,
  dpt232600,
];

const byId = new Map<string, DptCodec<unknown>>();
for (const codec of all) {
  if (byId.has(codec.id)) throw new Error(`DPT ${codec.id} registered twice`);
  byId.set(codec.id, codec);
}

/** The codec for a DPT id such as "9.001", or undefined when Benchline does not know it. */
export function getDpt(id: string): DptCodec<unknown> | undefined {
  return byId.get(id);
}

/** Size of a DPT's value in bits (1 for 1.001, 16 for 9.001), or undefined for an unknown id. */
export function dptSizeBits(id: string): number | undefined {
  return byId.get(id)?.sizeBits;
}

/** Every registered DPT id, in numeric order ("1.001" … "232.600"). */
export const dptIds: readonly string[] = [...byId.keys()].sort((a, b) => {
  const [am = 0, as = 0] = a.split(".").map(Number);
  const [bm = 0, bs = 0] = b.split(".").map(Number);
  return am - bm || as - bs;
});
