/**
 * The run's seeded random generator: xoshiro128** (Blackman and Vigna, 2018),
 * seeded through splitmix32 so that nearby seeds give unrelated streams. 32-bit
 * integer arithmetic only, so the sequence is identical in every JavaScript
 * engine. Nothing in engine/ uses Math.random.
 */
export interface Rng {
  /** Uniform float in [0, 1) with 32 bits of randomness. */
  next(): number;
  /** Uniform unsigned 32-bit integer. */
  nextUint32(): number;
  /** Uniform integer in [0, bound) for 0 < bound <= 2^32. */
  nextInt(bound: number): number;
  /** The four state words, for snapshots; `createRng` with `fromState` resumes from them. */
  state(): readonly [number, number, number, number];
}

function splitmix32(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

/**
 * Creates a generator from a seed (any finite number; it is reduced to 32 bits)
 * or resumes one from a saved state.
 */
export function createRng(
  seed: number,
  fromState?: readonly [number, number, number, number],
): Rng {
  if (!Number.isFinite(seed)) throw new Error(`createRng: seed ${seed} is not a finite number`);
  if (fromState) return new Xoshiro128(fromState[0], fromState[1], fromState[2], fromState[3]);
  const mix = splitmix32(Math.trunc(seed) >>> 0);
  const a = mix();
  const b = mix();
  const c = mix();
  return new Xoshiro128(a, b, c, mix());
}

/**
 * xoshiro128** over four 32-bit words. A class rather than closures over the
 * words: every run and every fork of a run builds one, and a class shares its
 * methods instead of creating four functions each time.
 */
class Xoshiro128 implements Rng {
  private a: number;
  private b: number;
  private c: number;
  private d: number;

  constructor(a: number, b: number, c: number, d: number) {
    this.a = a >>> 0;
    this.b = b >>> 0;
    this.c = c >>> 0;
    this.d = d >>> 0;
    // xoshiro must not start from the all-zero state.
    if ((this.a | this.b | this.c | this.d) === 0) this.a = 1;
  }

  next(): number {
    return this.nextUint32() / 4294967296;
  }

  nextUint32(): number {
    const result = Math.imul(rotl(Math.imul(this.b, 5), 7), 9) >>> 0;
    const t = this.b << 9;
    this.c ^= this.a;
    this.d ^= this.b;
    this.b ^= this.c;
    this.a ^= this.d;
    this.c ^= t;
    this.d = rotl(this.d, 11);
    return result;
  }

  nextInt(bound: number): number {
    if (!(bound > 0 && bound <= 4294967296) || !Number.isInteger(bound)) {
      throw new Error(`Rng.nextInt: bound ${bound} is not an integer in 1..2^32`);
    }
    return Math.floor((this.nextUint32() / 4294967296) * bound);
  }

  state(): readonly [number, number, number, number] {
    return [this.a >>> 0, this.b >>> 0, this.c >>> 0, this.d >>> 0];
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}
