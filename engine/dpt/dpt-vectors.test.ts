import { describe, expect, it } from "vitest";
import type { DptCodec } from "./dpt-codec";
import { getDpt } from "./registry";

function codec(id: string): DptCodec<unknown> {
  const c = getDpt(id);
  if (c === undefined) throw new Error(id);
  return c;
}
function enc(id: string, value: unknown): string {
  const r = codec(id).encode(value);
  if (!r.ok) throw new Error(r.error.message);
  return [...r.value].map((b) => b.toString(16).toUpperCase().padStart(2, "0")).join(" ");
}
function dec(id: string, ...bytes: number[]): unknown {
  const r = codec(id).decode(Uint8Array.from(bytes));
  if (!r.ok) throw new Error(r.error.message);
  return r.value;
}
function refusal(id: string, value: unknown): string {
  const r = codec(id).encode(value);
  return r.ok ? "accepted" : `${r.error.kind} ${r.error.message}`;
}
function decodeRefusal(id: string, ...bytes: number[]): string {
  const r = codec(id).decode(Uint8Array.from(bytes));
  return r.ok ? "accepted" : `${r.error.kind} ${r.error.message}`;
}

describe("bit-sized DPTs", () => {
  it("1.x: 0 off, 1 on in the low bit", () => {
    // DPT spec §3.1 (knx-reference.md table): 1.001 0 off, 1 on.
    expect(enc("1.001", true)).toBe("01");
    expect(enc("1.001", false)).toBe("00");
    expect(codec("1.001").format(true)).toBe("On");
    // DPT spec §3.1 (1.015 reset): 0 no action, 1 reset (from memory of the spec's table).
    expect(codec("1.015").format(true)).toBe("Reset");
    expect(dec("1.015", 1)).toBe(true);
    // DPT spec §4.2: 1.100 0 = cooling, 1 = heating.
    expect(dec("1.100", 0)).toBe(false);
    expect(codec("1.100").format(false)).toBe("Cooling");
    expect(codec("1.100").format(true)).toBe("Heating");
    expect(decodeRefusal("1.001", 2)).toMatch(
      /^dpt.out-of-range 1.001: payload 0x02 has bits set above its 1 bit/,
    );
    expect(refusal("1.001", 1)).toBe("dpt.wrong-type 1.001: expected a boolean, got number 1");
  });

  it("2.001: control in bit 1, value in bit 0", () => {
    // DPT spec §3.2: c v.
    expect(enc("2.001", { control: true, value: false })).toBe("02");
    expect(dec("2.001", 3)).toEqual({ control: true, value: true });
  });

  it("3.007: bit 3 direction, bits 0-2 step code, 0 = stop", () => {
    // DPT spec §3.3 (knx-reference.md table).
    expect(enc("3.007", { increase: true, stepCode: 1 })).toBe("09");
    expect(enc("3.007", { increase: false, stepCode: 4 })).toBe("04");
    expect(codec("3.007").format({ increase: true, stepCode: 0 })).toBe("Stop");
    expect(codec("3.007").format({ increase: false, stepCode: 3 })).toBe("Decrease by 25 %");
    expect(refusal("3.007", { increase: true, stepCode: 8 })).toMatch(
      /3.007: stepCode 8 is not an integer in 0..7/,
    );
  });
});

describe("octet DPTs", () => {
  it("5.001: 0..100 % on 0..255", () => {
    // DPT spec §3.5 (knx-reference.md table): 50 % = 0x80, 100 % = 0xFF.
    expect(enc("5.001", 50)).toBe("80");
    expect(enc("5.001", 100)).toBe("FF");
    expect(enc("5.001", 0)).toBe("00");
    expect(dec("5.001", 0xff)).toBe(100);
    expect(codec("5.001").format(dec("5.001", 0x80))).toBe("50.2 %");
    expect(refusal("5.001", 101)).toBe("dpt.out-of-range 5.001: 101 is above the maximum 100 %");
    expect(refusal("5.001", -1)).toBe("dpt.out-of-range 5.001: -1 is below the minimum 0 %");
    // DPT spec §3.5: 5.003 0..360 ° on 0..255.
    expect(enc("5.003", 360)).toBe("FF");
    expect(dec("5.003", 0xff)).toBe(360);
  });

  it("5.100 fan stage and 5.010 counter: plain 0..255", () => {
    // knx-reference.md: 5.100 0..255 (in libraries; not in the v02.02.01 overview).
    expect(enc("5.100", 3)).toBe("03");
    expect(refusal("5.100", 256)).toBe("dpt.out-of-range 5.100: 256 is above the maximum 255");
    expect(refusal("5.010", 2.5)).toMatch(/wrong-type 5.010: expected an integer/);
  });

  it("6.x, 7.x, 8.x: two's complement and unsigned, MSB first", () => {
    // DPT spec §3.6: 6.010 -128..127 two's complement.
    expect(enc("6.010", -1)).toBe("FF");
    expect(dec("6.010", 0x80)).toBe(-128);
    // knx-reference.md table: 7.001 0..65535 MSB first.
    expect(enc("7.001", 0x1234)).toBe("12 34");
    expect(enc("7.012", 65535)).toBe("FF FF");
    expect(refusal("7.001", 65536)).toBe(
      "dpt.out-of-range 7.001: 65536 is above the maximum 65535 pulses",
    );
    // DPT spec §3.8: 8.001 -32768..32767.
    expect(enc("8.001", -32768)).toBe("80 00");
    expect(dec("8.001", 0xff, 0xfe)).toBe(-2);
  });

  it("12.001 / 13.001: 4 octets unsigned / two's complement", () => {
    // knx-reference.md table: 12.001 unsigned, 13.001 two's complement.
    expect(enc("12.001", 4294967295)).toBe("FF FF FF FF");
    expect(dec("12.001", 0x80, 0, 0, 1)).toBe(2147483649);
    expect(enc("13.001", -2147483648)).toBe("80 00 00 00");
    expect(enc("13.001", -2)).toBe("FF FF FF FE");
    expect(dec("13.001", 0xff, 0xff, 0xff, 0xff)).toBe(-1);
    expect(refusal("13.001", 2147483648)).toMatch(/above the maximum 2147483647 pulses/);
  });

  it("14.x: IEEE 754 single, big-endian", () => {
    // knx-reference.md table: 14.x IEEE 754 single big-endian; IEEE 754 binary32: 1.0 = 0x3F800000, 21.5 = 0x41AC0000.
    expect(enc("14.056", 1)).toBe("3F 80 00 00");
    expect(enc("14.068", 21.5)).toBe("41 AC 00 00");
    expect(enc("14.068", -2)).toBe("C0 00 00 00");
    expect(dec("14.068", 0x41, 0xac, 0, 0)).toBe(21.5);
    expect(dec("14.068", 0x3d, 0xcc, 0xcc, 0xcd)).toBe(Math.fround(0.1));
    expect(codec("14.068").format(Math.fround(0.1))).toBe("0.1 °C");
    // IEEE 754 binary32: 0x7FC00000 is NaN, 0x7F800000 infinity; neither is a bench value.
    expect(decodeRefusal("14.068", 0x7f, 0xc0, 0, 0)).toMatch(
      /out-of-range 14.068: payload is NaN/,
    );
    expect(decodeRefusal("14.068", 0x7f, 0x80, 0, 0)).toMatch(/payload is Infinity/);
    expect(refusal("14.068", 1e39)).toMatch(/out-of-range 14.068: 1e\+39 is beyond/);
  });

  it("16.000 / 16.001: 14 characters padded with 0x00", () => {
    // DPT spec §3.16: "KNX is OK" is the spec's example, ASCII padded with 0x00.
    expect(enc("16.000", "KNX is OK")).toBe("4B 4E 58 20 69 73 20 4F 4B 00 00 00 00 00");
    expect(dec("16.000", 0x4b, 0x4e, 0x58, 0x20, 0x69, 0x73, 0x20, 0x4f, 0x4b, 0, 0, 0, 0, 0)).toBe(
      "KNX is OK",
    );
    expect(enc("16.000", "")).toBe("00 ".repeat(13) + "00");
    // ISO 8859-1 (16.001) carries é as 0xE9; ASCII (16.000) cannot.
    expect(enc("16.001", "é")).toBe("E9" + " 00".repeat(13));
    expect(refusal("16.000", "é")).toMatch(/out-of-range 16.000: character "é" at 0 is not ASCII/);
    expect(refusal("16.001", "€")).toMatch(/not ISO 8859-1/);
    expect(refusal("16.000", "fifteen chars!!")).toBe(
      "dpt.out-of-range 16.000: text has 15 characters, the limit is 14",
    );
    expect(decodeRefusal("16.000", 0x41, 0, 0x42, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0)).toMatch(
      /follows the 0x00 padding/,
    );
  });

  it("17.001: scenes 1..64 travel as 0..63", () => {
    // knx-reference.md table, DPT spec §3.18.
    expect(enc("17.001", 1)).toBe("00");
    expect(enc("17.001", 64)).toBe("3F");
    expect(dec("17.001", 0)).toBe(1);
    expect(codec("17.001").format(3)).toBe("Scene 3");
    expect(refusal("17.001", 0)).toBe(
      "dpt.out-of-range 17.001: scene 0 is not an integer in 1..64",
    );
    expect(refusal("17.001", 65)).toMatch(/scene 65 is not an integer in 1..64/);
    expect(decodeRefusal("17.001", 0x40)).toMatch(/out-of-range 17.001/);
  });

  it("18.001: bit 7 learn, bit 6 reserved, bits 0-5 scene", () => {
    // knx-reference.md table, DPT spec §3.19.
    expect(enc("18.001", { learn: true, scene: 1 })).toBe("80");
    expect(enc("18.001", { learn: false, scene: 64 })).toBe("3F");
    expect(dec("18.001", 0x85)).toEqual({ learn: true, scene: 6 });
    expect(codec("18.001").format({ learn: false, scene: 2 })).toBe("Recall scene 2");
    expect(decodeRefusal("18.001", 0x40)).toMatch(/reserved bit 6/);
  });

  it("20.102 / 20.105: HVAC mode tables, reserved codes refused", () => {
    // knx-reference.md table (DPT spec §4): 20.102 1 comfort, 4 building protection.
    expect(enc("20.102", 1)).toBe("01");
    expect(codec("20.102").format(4)).toBe("Building protection");
    expect(refusal("20.102", 5)).toBe(
      "dpt.out-of-range 20.102: code 5 is reserved; valid codes are 0, 1, 2, 3, 4",
    );
    // 20.105: 3 cool, 9 fan only, 14 dehumidification, 20 NoDem; 18, 19, 21.. reserved.
    expect(codec("20.105").format(3)).toBe("Cool");
    expect(codec("20.105").format(9)).toBe("Fan only");
    expect(codec("20.105").format(14)).toBe("Dehumidification");
    expect(enc("20.105", 20)).toBe("14");
    expect(decodeRefusal("20.105", 18)).toMatch(/code 18 is reserved/);
    expect(decodeRefusal("20.105", 21)).toMatch(/code 21 is reserved/);
  });

  it("232.600: R, G, B with R first", () => {
    // knx-reference.md table.
    expect(enc("232.600", { r: 255, g: 128, b: 0 })).toBe("FF 80 00");
    expect(dec("232.600", 1, 2, 3)).toEqual({ r: 1, g: 2, b: 3 });
    expect(codec("232.600").format({ r: 255, g: 128, b: 0 })).toBe("#FF8000");
    expect(refusal("232.600", { r: 256, g: 0, b: 0 })).toBe(
      "dpt.out-of-range 232.600: r 256 is not an integer in 0..255",
    );
  });
});
