import { describe, expect, it } from "vitest";
import { createRng } from "./rng";

describe("createRng", () => {
  it("follows xoshiro128** from a given state", () => {
    // Reference algorithm (Blackman & Vigna, xoshiro128starstar.c): result = rotl(s[1] * 5, 7) * 9;
    // from state {1, 2, 3, 4} the first output is rotl(10, 7) * 9 = 1280 * 9 = 11520.
    const rng = createRng(0, [1, 2, 3, 4]);
    expect(rng.nextUint32()).toBe(11520);
  });

  it("gives the same stream for the same seed and a different one for another seed", () => {
    const a = createRng(42);
    const b = createRng(42);
    const c = createRng(43);
    const seqA = Array.from({ length: 20 }, () => a.nextUint32());
    expect(Array.from({ length: 20 }, () => b.nextUint32())).toEqual(seqA);
    expect(Array.from({ length: 20 }, () => c.nextUint32())).not.toEqual(seqA);
  });

  it("resumes exactly from a saved state", () => {
    const a = createRng(7);
    a.next();
    const saved = a.state();
    const expected = [a.next(), a.next(), a.next()];
    const b = createRng(0, saved);
    expect([b.next(), b.next(), b.next()]).toEqual(expected);
  });

  it("stays in [0, 1) and spreads evenly over ten bins", () => {
    const rng = createRng(1);
    const bins = new Array<number>(10).fill(0);
    let outside = 0;
    for (let i = 0; i < 100_000; i++) {
      const x = rng.next();
      if (!(x >= 0 && x < 1)) outside++;
      else bins[Math.floor(x * 10)]!++;
    }
    expect(outside).toBe(0);
    for (const count of bins) expect(Math.abs(count - 10_000)).toBeLessThan(500);
  });

  it("draws integers below the bound and rejects a bad bound", () => {
    const rng = createRng(3);
    for (let i = 0; i < 1000; i++) expect(rng.nextInt(6)).toBeLessThan(6);
    expect(() => rng.nextInt(0)).toThrow(/bound/);
  });
});
