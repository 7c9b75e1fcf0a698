import { describe, expect, it } from "vitest";
import {
  bitTimesToUs,
  frameBitTimes,
  frameDurationUs,
  telegramOccupancyBitTimes,
  telegramOccupancyUs,
} from "./timing";

describe("TP1 timing", () => {
  it("uses the 9600 bit/s bit time", () => {
    // Basic course: one bit = 1/9600 s, about 104 µs.
    expect(bitTimesToUs(1)).toBe(104);
    expect(bitTimesToUs(9600)).toBe(1_000_000);
    // 3 bit times = 312.5 µs: rounded once, not 3 × 104.
    expect(bitTimesToUs(3)).toBe(313);
  });

  it("counts 13 bit times per character", () => {
    // TP1 conformance §10.1.2: 11-bit character + 2-bit pause.
    expect(frameBitTimes(1)).toBe(13);
    expect(frameBitTimes(9)).toBe(117);
    expect(frameDurationUs(9)).toBe(12188); // 117 / 9600 s = 12187.5 µs
  });

  it("gives a short switching telegram 193 bit times, about 20 ms", () => {
    // Basic course: 50 idle + 9 × 13 + 15 + 11 = 193 bit times, about 20 ms.
    expect(telegramOccupancyBitTimes(9)).toBe(193);
    expect(telegramOccupancyUs(9)).toBe(20104);
    // Derived in knx-reference.md: on the order of 50 such telegrams per second.
    expect(Math.floor(1_000_000 / telegramOccupancyUs(9))).toBe(49);
  });
});
