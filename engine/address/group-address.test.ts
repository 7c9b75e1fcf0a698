import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { formatGroupAddress, parseGroupAddress, type GroupAddressStyle } from "./group-address";
import { groupAddressTextSchema } from "./address-schemas";

function raw(text: string): number {
  const r = parseGroupAddress(text);
  if (!r.ok) throw new Error(r.error.message);
  return r.value;
}

describe("parseGroupAddress", () => {
  it("reads the three notations into the same raw form", () => {
    // Basic course worked frame: destination 1/0/1 travels as 08 01.
    expect(raw("1/0/1")).toBe(0x0801);
    // knx-reference.md Addresses: raw = main<<11 | middle<<8 | sub; 2-level main<<11 | sub.
    expect(raw("1/257")).toBe((1 << 11) | 257);
    expect(raw("1/1/1")).toBe(raw("1/257"));
    expect(raw("4097")).toBe(4097);
    expect(raw("31/7/255")).toBe(0xffff);
    expect(raw("31/2047")).toBe(0xffff);
    expect(raw("65535")).toBe(0xffff);
    expect(raw(" 2/3/4 ")).toBe((2 << 11) | (3 << 8) | 4);
  });

  it("refuses the broadcast address 0/0/0 in every notation", () => {
    // knx-reference.md Addresses: 0/0/0 is broadcast, not a group.
    for (const text of ["0/0/0", "0/0", "0"]) {
      const r = parseGroupAddress(text);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.error.message).toMatch(/broadcast/);
    }
  });

  it("names the part that is out of range", () => {
    const cases: [string, RegExp][] = [
      ["32/0/0", /main group 32 is above 31/],
      ["1/8/0", /middle group 8 is above 7/],
      ["1/0/256", /sub group 256 is above 255/],
      ["1/2048", /sub group 2048 is above 2047/],
      ["65536", /above 65535/],
      ["1/0/1/1", /4 parts/],
      ["1/-1/1", /numbers separated/],
      ["a/b/c", /numbers separated/],
      ["", /numbers separated/],
      ["1e3", /numbers separated/],
      ["1//1", /numbers separated/],
    ];
    for (const [text, message] of cases) {
      const r = parseGroupAddress(text);
      expect(r).toMatchObject({ ok: false, error: { kind: "address.invalid", input: text } });
      if (!r.ok) expect(r.error.message).toMatch(message);
    }
  });

  it("validates bench JSON text through the zod schema with the same message", () => {
    expect(groupAddressTextSchema.safeParse("1/0/1").success).toBe(true);
    const bad = groupAddressTextSchema.safeParse("1/9/1");
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0]?.message).toMatch(/middle group 9/);
  });
});

describe("formatGroupAddress", () => {
  it("formats in each style", () => {
    expect(formatGroupAddress(0x0801)).toBe("1/0/1");
    expect(formatGroupAddress(0x0901, "two-level")).toBe("1/257");
    expect(formatGroupAddress(0x0901, "free")).toBe("2305");
  });

  it("throws on a raw value that is not 16 bits (a bug, not input)", () => {
    expect(() => formatGroupAddress(65536)).toThrow(RangeError);
    expect(() => formatGroupAddress(1.5)).toThrow(RangeError);
  });

  it("round-trips every non-broadcast raw address in every style", () => {
    const styles: GroupAddressStyle[] = ["three-level", "two-level", "free"];
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 0xffff }), fc.constantFrom(...styles), (r, style) => {
        expect(raw(formatGroupAddress(r, style))).toBe(r);
      }),
    );
  });
});
