import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { formatDuration, parseDuration } from "./duration";

// Durations are Benchline's own notation; the expected values are plain unit arithmetic.
describe("parseDuration", () => {
  it.each([
    ["500ms", 500_000],
    ["30s", 30_000_000],
    ["2m", 120_000_000],
    ["1h", 3_600_000_000],
    ["250us", 250],
    ["250µs", 250],
    ["1.5s", 1_500_000],
    ["1m30s", 90_000_000],
    ["0ms", 0],
    [" 20ms ", 20_000],
  ])("%s is %i µs", (text, us) => {
    expect(parseDuration(text)).toEqual({ ok: true, value: us });
  });

  it.each(["", "5", "5 secs", "ms", "-1s", "1.5", "1d", "0.5us", "1e3ms", "25h", "s5"])(
    "refuses %j with a typed error that shows an example",
    (text) => {
      const result = parseDuration(text);
      expect(result.ok).toBe(false);
      if (result.ok) return;
      expect(result.error.kind).toBe("duration.invalid");
      expect(result.error.input).toBe(text);
      expect(result.error.message).toContain('expected a duration like "500ms"');
    },
  );

  it("formats back to the same number of microseconds", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 24 * 3_600_000_000 }), (us) => {
        expect(parseDuration(formatDuration(us))).toEqual({ ok: true, value: us });
      }),
    );
  });

  it("formats with the largest whole unit", () => {
    expect(formatDuration(90_000_000)).toBe("90s");
    expect(formatDuration(120_000_000)).toBe("2m");
    expect(formatDuration(1_500)).toBe("1500us");
    expect(formatDuration(20_000)).toBe("20ms");
  });
});
