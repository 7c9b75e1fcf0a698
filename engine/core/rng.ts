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
  let a: number, b: number, c: number, d: number;
  if (fromState) {
    [a, b, c, d] = fromState.map((w) => w >>> 0) as [number, number, number, number];
  } else {
    const mix = splitmix32(Math.trunc(seed) >>> 0);
    a = mix();
    b = mix();
    c = mix();
    d = mix();
  }
  // xoshiro must not start from the all-zero state.
  if ((a | b | c | d) === 0) a = 1;

  const nextUint32 = (): number => {
    const result = Math.imul(rotl(Math.imul(b, 5), 7), 9) >>> 0;
    const t = b << 9;
    c ^= a;
    d ^= b;
    b ^= c;
    a ^= d;
    c ^= t;
    d = rotl(d, 11);
    return result;
  };

  return {
    next: () => nextUint32() / 4294967296,
    nextUint32,
    nextInt: (bound: number) => {
      if (!(bound > 0 && bound <= 4294967296) || !Number.isInteger(bound)) {
        throw new Error(`Rng.nextInt: bound ${bound} is not an integer in 1..2^32`);
      }
      return Math.floor((nextUint32() / 4294967296) * bound);
    },
    state: () => [a >>> 0, b >>> 0, c >>> 0, d >>> 0],
  };
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}
