import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { DptCodec } from "./dpt-codec";
import {
  DPT9_INVALID,
  DPT9_MAX,
  DPT9_MIN,
  decodeFloat16Raw,
  dpt9Codecs,
  encodeFloat16Raw,
  isDptInvalid,
  type Dpt9Value,
} from "./dpt9";

function codec(id: string): DptCodec<Dpt9Value> {
  const c = dpt9Codecs.find((x) => x.id === id);
  if (c === undefined) throw new Error(id);
  return c;
}
const temperature = codec("9.001");
const difference = codec("9.002"); // full format range, so every pattern is a value of it

function hex(value: Dpt9Value, c = temperature): string {
  const r = c.encode(value);
  if (!r.ok) throw new Error(r.error.message);
  return [...r.value].map((b) => b.toString(16).toUpperCase().padStart(2, "0")).join(" ");
}
function decode(b0: number, b1: number, c = difference): Dpt9Value {
  const r = c.decode(Uint8Array.of(b0, b1));
  if (!r.ok) throw new Error(r.error.message);
  return r.value;
}
/** Exponent of a raw pattern and whether it is the canonical (smallest-exponent) encoding. */
function isCanonical(raw: number): boolean {
  const e = (raw >>> 11) & 0x0f;
  const m = (raw & 0x7ff) - (raw & 0x8000 ? 2048 : 0);
  // At E - 1 the mantissa would be 2M; canonical when that does not fit -2048..2047.
  return e === 0 || 2 * m > 2047 || 2 * m < -2048;
}

describe("DPT 9.x reference vectors", () => {
  it("encodes the worked values of the spec", () => {
    // DPT spec §3.10 (knx-reference.md worked values):
    expect(hex(21)).toBe("0C 1A"); // 21.00 °C -> 0C 1A
    expect(hex(0)).toBe("00 00"); // 0 -> 00 00
    expect(hex(-30)).toBe("8A 24"); // -30.00 -> 8A 24
    expect(hex(0.01)).toBe("00 01"); // 0.01 -> 00 01
    expect(hex(-0.01)).toBe("87 FF"); // -0.01 -> 87 FF
    expect(hex(20.48)).toBe("0C 00"); // 20.48 -> 0C 00
  });

  it("decodes the worked values back", () => {
    // DPT spec §3.10, same vectors.
    expect(decode(0x0c, 0x1a)).toBe(21);
    expect(decode(0x00, 0x00)).toBe(0);
    expect(decode(0x8a, 0x24)).toBe(-30);
    expect(decode(0x00, 0x01)).toBe(0.01);
    expect(decode(0x87, 0xff)).toBe(-0.01);
    expect(decode(0x0c, 0x00)).toBe(20.48);
  });

  it("has the range ends of v02.02.01 and 0x7FFF as invalid data", () => {
    // DPT spec §3.10 v02.02.01: largest 670433.28 (0x7FFE), smallest -671088.64 (0xF800).
    expect(decode(0x7f, 0xfe)).toBe(DPT9_MAX);
    expect(decode(0xf8, 0x00)).toBe(DPT9_MIN);
    expect(hex(DPT9_MAX, difference)).toBe("7F FE");
    expect(hex(DPT9_MIN, difference)).toBe("F8 00");
    // DPT spec §3.10: 0x7FFF means invalid data, an explicit marker, never a number.
    expect(decode(0x7f, 0xff, temperature)).toBe(DPT9_INVALID);
    expect(isDptInvalid(decode(0x7f, 0xff))).toBe(true);
    expect(hex(DPT9_INVALID)).toBe("7F FF");
    expect(hex({ invalid: true })).toBe("7F FF"); // the JSON form of the marker
  });

  it("refuses values outside the range with a typed error naming the DPT and limit", () => {
    // DPT spec §3.10: 670433.28 is the top (older versions' 670760.96 is the invalid pattern).
    expect(temperature.encode(670433.29)).toMatchObject({
      ok: false,
      error: {
        kind: "dpt.out-of-range",
        dpt: "9.001",
        message: "9.001: 670433.29 is above the maximum 670433.28 °C",
      },
    });
    expect(difference.encode(670760.96)).toMatchObject({
      ok: false,
      error: { kind: "dpt.out-of-range" },
    });
    expect(difference.encode(-671088.65)).toMatchObject({
      ok: false,
      error: { kind: "dpt.out-of-range" },
    });
    // knx-reference.md: 9.001 is limited to -273 °C at the bottom.
    expect(temperature.encode(-273.01)).toMatchObject({
      ok: false,
      error: { kind: "dpt.out-of-range", message: "9.001: -273.01 is below the minimum -273 °C" },
    });
    expect(temperature.encode(-273).ok).toBe(true);
    // -300 °C on the wire (E=5, M=-938 -> 0xAC56) is not a temperature.
    expect(temperature.decode(Uint8Array.of(0xac, 0x56))).toMatchObject({
      ok: false,
      error: { kind: "dpt.out-of-range" },
    });
  });

  it("refuses the wrong type and the wrong payload length", () => {
    for (const bad of [NaN, Infinity, "21", null, undefined, true, { invalid: false }]) {
      const r = temperature.encode(bad as unknown as Dpt9Value);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(["dpt.wrong-type", "dpt.out-of-range"]).toContain(r.error.kind);
    }
    expect(temperature.encode("21" as unknown as number)).toMatchObject({
      error: { kind: "dpt.wrong-type", dpt: "9.001" },
    });
    expect(temperature.decode(Uint8Array.of(0x0c))).toMatchObject({
      ok: false,
      error: { kind: "dpt.payload-length", message: "9.001: payload must be 2 bytes, got 1" },
    });
  });

  it("formats with two decimals and the unit", () => {
    expect(temperature.format(21)).toBe("21.00 °C");
    expect(codec("9.007").format(45.5)).toBe("45.50 %");
    expect(temperature.format(DPT9_INVALID)).toBe("invalid");
  });
});

describe("DPT 9.x rounding rule: half away from zero on the 0.01 scale at the chosen exponent", () => {
  it("rounds exact halves away from zero", () => {
    // Benchline's stated rule (the DPT spec leaves halves open; knx-reference.md).
    // 20.49 -> 2049 hundredths; E=1 gives 1024.5 -> 1025 = 0x401 -> 20.50, raw 0x0800 | 0x401.
    expect(hex(20.49, difference)).toBe("0C 01");
    expect(decode(0x0c, 0x01)).toBe(20.5);
    expect(hex(-20.49, difference)).toBe("8B FF"); // -1024.5 -> -1025 -> -20.50
    expect(decode(0x8b, 0xff)).toBe(-20.5);
    // Half a hundredth at E=0: 0.005 -> 0.5 -> 1 -> 0.01; -0.005 -> -0.01.
    expect(hex(0.005, difference)).toBe("00 01");
    expect(hex(-0.005, difference)).toBe("87 FF");
  });

  it("takes decimal inputs at face value despite binary noise (regression: 32.05)", () => {
    // 32.05 · 100 is 3204.9999999999995 in binary floating point; without the 1e-6 snap it
    // would round to 1602 (32.04) instead of the rule's 1602.5 -> 1603 (32.06).
    expect(hex(32.05, difference)).toBe("0E 43");
    expect(decode(0x0e, 0x43)).toBe(32.06);
  });

  it("picks the smallest exponent whose rounded mantissa fits", () => {
    // DPT spec §3.10: encoders choose the smallest E. 20.47 fits at E=0 (M=2047).
    expect(hex(20.47, difference)).toBe("07 FF");
    // 20.475 -> 2047.5 rounds to 2048, which does not fit at E=0, so E=1, M=1024 -> 20.48.
    expect(hex(20.475, difference)).toBe("0C 00");
    // -20.48 fits at E=0 (M=-2048).
    expect(hex(-20.48, difference)).toBe("80 00");
  });
});

describe("DPT 9.x properties", () => {
  const inRange = fc.double({ min: DPT9_MIN, max: DPT9_MAX, noNaN: true });

  it("round-trips within half a step of the chosen exponent", () => {
    fc.assert(
      fc.property(inRange, (v) => {
        const raw = encodeFloat16Raw(v);
        const step = 0.01 * 2 ** ((raw >>> 11) & 0x0f);
        const back = decodeFloat16Raw(raw);
        expect(Math.abs(back - v)).toBeLessThanOrEqual(step / 2 + 1e-9 * Math.max(1, Math.abs(v)));
        expect(isCanonical(raw)).toBe(true);
      }),
      { numRuns: 5000 },
    );
  });

  it("is monotonic: a larger value never encodes to a smaller one", () => {
    fc.assert(
      fc.property(inRange, inRange, (a, b) => {
        const [lo, hi] = a <= b ? [a, b] : [b, a];
        expect(decodeFloat16Raw(encodeFloat16Raw(lo))).toBeLessThanOrEqual(
          decodeFloat16Raw(encodeFloat16Raw(hi)),
        );
      }),
      { numRuns: 5000 },
    );
  });

  it("is monotonic across every canonical code, in value order", () => {
    // Exhaustive: sort all finite values, encode each, and check the decoded sequence never falls.
    const values: number[] = [];
    for (let raw = 0; raw <= 0xffff; raw++) if (raw !== 0x7fff) values.push(decodeFloat16Raw(raw));
    values.sort((x, y) => x - y);
    // One expect at the end keeps 65535 checks fast; the list names any offender.
    const offenders: string[] = [];
    let previous = -Infinity;
    for (const v of values) {
      const back = decodeFloat16Raw(encodeFloat16Raw(v));
      // Every representable value survives re-encoding exactly, and order is kept.
      if (back !== v || back < previous) offenders.push(`${v} -> ${back}`);
      previous = back;
    }
    expect(offenders).toEqual([]);
  });

  it("decodes every 2-byte pattern except 0x7FFF to a finite value whose re-encoding is canonical", () => {
    const offenders: string[] = [];
    for (let raw = 0; raw <= 0xffff; raw++) {
      const value = decode(raw >>> 8, raw & 0xff);
      if (raw === 0x7fff) {
        if (value !== DPT9_INVALID) offenders.push("0x7FFF is not the invalid marker");
        continue;
      }
      if (typeof value !== "number" || !Number.isFinite(value)) {
        offenders.push(`0x${raw.toString(16)} -> ${String(value)}`);
        continue;
      }
      const again = encodeFloat16Raw(value);
      const wrong =
        !isCanonical(again) ||
        decodeFloat16Raw(again) !== value ||
        (isCanonical(raw) && again !== raw);
      if (wrong) offenders.push(`0x${raw.toString(16)} -> ${value} -> 0x${again.toString(16)}`);
    }
    expect(offenders).toEqual([]);
  });

  it("agrees between valueSchema and encode on the accepted range", () => {
    fc.assert(
      fc.property(fc.double({ min: -700000, max: 700000, noNaN: true }), (v) => {
        expect(temperature.valueSchema.safeParse(v).success).toBe(temperature.encode(v).ok);
      }),
    );
  });
});
