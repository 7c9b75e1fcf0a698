import { describe, expect, it } from "vitest";
import { formatVirtualTime } from "./virtual-time";

// The shape is our own (h:mm:ss.mmm, like a stopwatch); the arithmetic is plain
// unit conversion: 1 h = 3 600 s, 1 s = 1 000 ms = 1 000 000 µs.
describe("formatVirtualTime", () => {
  it("prints the three times from one CLI trace block in one format", () => {
    expect(formatVirtualTime(10_801_000_000)).toBe("3:00:01.000");
    expect(formatVirtualTime(10_801_020_104)).toBe("3:00:01.020");
    expect(formatVirtualTime(10_802_035_000)).toBe("3:00:02.035");
  });

  it("starts at zero and pads minutes, seconds and milliseconds", () => {
    expect(formatVirtualTime(0)).toBe("0:00:00.000");
    expect(formatVirtualTime(61_005_000)).toBe("0:01:01.005");
    expect(formatVirtualTime(24 * 3_600_000_000)).toBe("24:00:00.000");
  });

  it("cuts sub-millisecond parts instead of rounding up", () => {
    expect(formatVirtualTime(999_999)).toBe("0:00:00.999");
  });

  it("shows microseconds only when asked", () => {
    expect(formatVirtualTime(10_801_020_104, { precision: "us" })).toBe("3:00:01.020104");
    expect(formatVirtualTime(7, { precision: "us" })).toBe("0:00:00.000007");
  });

  it("refuses what is not a point in virtual time", () => {
    expect(() => formatVirtualTime(-1)).toThrow(/non-negative integer/);
    expect(() => formatVirtualTime(1.5)).toThrow(/non-negative integer/);
  });
});
