import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { formatIndividualAddress, parseIndividualAddress } from "./individual-address";
import { individualAddressTextSchema } from "./address-schemas";

describe("individual addresses", () => {
  it("reads area.line.device into area<<12 | line<<8 | device", () => {
    // Basic course worked frame: source 1.1.1 travels as 11 01.
    expect(parseIndividualAddress("1.1.1")).toEqual({ ok: true, value: 0x1101 });
    // knx-reference.md Addresses: 15.15.255 is the unprogrammed default, raw 0xFFFF.
    expect(parseIndividualAddress("15.15.255")).toEqual({ ok: true, value: 0xffff });
    expect(parseIndividualAddress("1.1.10")).toEqual({ ok: true, value: 0x110a });
    expect(formatIndividualAddress(0x110a)).toBe("1.1.10");
  });

  it("names the part that is out of range", () => {
    const cases: [string, RegExp][] = [
      ["16.0.1", /area 16 is above 15/],
      ["1.16.1", /line 16 is above 15/],
      ["1.1.256", /device 256 is above 255/],
      ["1.1", /area\.line\.device/],
      ["1/1/1", /area\.line\.device/],
      ["1.1.-1", /area\.line\.device/],
    ];
    for (const [text, message] of cases) {
      const r = parseIndividualAddress(text);
      expect(r).toMatchObject({ ok: false, error: { kind: "address.invalid", input: text } });
      if (!r.ok) expect(r.error.message).toMatch(message);
    }
    expect(individualAddressTextSchema.safeParse("1.1.300").success).toBe(false);
  });

  it("round-trips every raw address", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 0xffff }), (r) => {
        expect(parseIndividualAddress(formatIndividualAddress(r))).toEqual({ ok: true, value: r });
      }),
    );
  });
});
