import { describe, expect, it } from "vitest";
import { thinSamples } from "./thin-samples";

describe("thinSamples", () => {
  it("keeps a short list as it is", () => {
    const list = [1, 2, 3];
    expect(thinSamples(list, 5)).toBe(list);
  });

  it("keeps at most the limit, the first and the newest, in order", () => {
    const list = Array.from({ length: 1000 }, (_, i) => i);
    const thinned = thinSamples(list, 200);
    expect(thinned).toHaveLength(200);
    expect(thinned[0]).toBe(0);
    expect(thinned.at(-1)).toBe(999);
    expect([...thinned].sort((a, b) => a - b)).toEqual(thinned);
  });
});
