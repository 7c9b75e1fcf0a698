import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { DptCodec } from "./dpt-codec";
import { payloadOctets } from "./dpt-codec";
import { dptIds, dptSizeBits, getDpt } from "./registry";
import { HVAC_CONTROLLER_MODES, HVAC_MODES } from "./dpt20";

/** Every DPT issue 3 asks for (14.x stands for the IEEE single family). */
const required = [
  "1.001",
  "1.003",
  "1.005",
  "1.018",
  "1.019",
  "1.100",
  "2.001",
  "3.007",
  "5.001",
  "5.003",
  "5.010",
  "5.100",
  "6.010",
  "7.001",
  "7.012",
  "8.001",
  "9.001",
  "9.002",
  "9.004",
  "9.007",
  "12.001",
  "13.001",
  "14.068",
  "16.000",
  "16.001",
  "17.001",
  "18.001",
  "20.102",
  "20.105",
  "232.600",
];

function codec(id: string): DptCodec<unknown> {
  const c = getDpt(id);
  if (c === undefined) throw new Error(`missing ${id}`);
  return c;
}

/** Values a codec must accept, and how close decode(encode(v)) must come back. */
function valuesFor(c: DptCodec<unknown>): {
  arb: fc.Arbitrary<unknown>;
  same: (a: unknown, b: unknown) => boolean;
} {
  const exact = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b);
  const [main] = c.id.split(".");
  switch (main) {
    case "1":
      return { arb: fc.boolean(), same: exact };
    case "2":
      return { arb: fc.record({ control: fc.boolean(), value: fc.boolean() }), same: exact };
    case "3":
      return {
        arb: fc.record({ increase: fc.boolean(), stepCode: fc.integer({ min: 0, max: 7 }) }),
        same: exact,
      };
    case "9": {
      // Half a step is at most 0.005 at E=0 and at most |v| / 2048 above (|M| >= 1024 there);
      // dpt9.test.ts checks the exact step.
      const arb = fc.double({ min: c.min as number, max: c.max as number, noNaN: true });
      const near = (a: unknown, b: unknown) =>
        Math.abs((a as number) - (b as number)) <=
        Math.max(0.005, Math.abs(a as number) / 2048) + 1e-9;
      return { arb, same: near };
    }
    case "14":
      return {
        arb: fc.double({ min: c.min as number, max: c.max as number, noNaN: true }),
        same: (a, b) => Math.fround(a as number) === b,
      };
    case "16": {
      const highest = c.id === "16.000" ? 0x7f : 0xff;
      const ch = fc.integer({ min: 1, max: highest }).map((n) => String.fromCharCode(n));
      return { arb: fc.array(ch, { maxLength: 14 }).map((a) => a.join("")), same: exact };
    }
    case "18":
      return {
        arb: fc.record({ learn: fc.boolean(), scene: fc.integer({ min: 1, max: 64 }) }),
        same: exact,
      };
    case "20":
      return {
        arb: fc.constantFrom(
          ...Object.keys(c.id === "20.102" ? HVAC_MODES : HVAC_CONTROLLER_MODES).map(Number),
        ),
        same: exact,
      };
    case "232":
      return {
        arb: fc.record({
          r: fc.integer({ min: 0, max: 255 }),
          g: fc.integer({ min: 0, max: 255 }),
          b: fc.integer({ min: 0, max: 255 }),
        }),
        same: exact,
      };
  }
  if (c.id === "5.001" || c.id === "5.003") {
    const top = c.max as number;
    return {
      arb: fc.double({ min: 0, max: top, noNaN: true }),
      same: (a, b) => Math.abs((a as number) - (b as number)) <= top / 255 / 2 + 1e-9,
    };
  }
  // Integer DPTs: 5.x unscaled, 6.x, 7.x, 8.x, 12.x, 13.x, 17.001.
  return { arb: fc.integer({ min: c.min as number, max: c.max as number }), same: exact };
}

describe("DPT registry", () => {
  it("knows every DPT the issue asks for, in numeric order", () => {
    for (const id of required) expect(dptIds, id).toContain(id);
    expect(dptIds.indexOf("9.001")).toBeLessThan(dptIds.indexOf("14.068"));
    expect(dptIds.indexOf("5.100")).toBeLessThan(dptIds.indexOf("6.001"));
    expect(getDpt("99.999")).toBeUndefined();
    expect(dptSizeBits("1.001")).toBe(1);
    expect(dptSizeBits("9.001")).toBe(16);
    expect(dptSizeBits("16.000")).toBe(112);
    expect(dptSizeBits("nope")).toBeUndefined();
  });

  describe.each(dptIds)("%s", (id) => {
    const c = codec(id);
    const { arb, same } = valuesFor(c);

    it("round-trips generated values within its resolution, with the payload convention's size", () => {
      fc.assert(
        fc.property(arb, (v) => {
          const encoded = c.encode(v);
          if (!encoded.ok) throw new Error(encoded.error.message);
          expect(encoded.value.length).toBe(payloadOctets(c.sizeBits));
          const decoded = c.decode(encoded.value);
          if (!decoded.ok) throw new Error(decoded.error.message);
          expect(
            same(v, decoded.value),
            `${JSON.stringify(v)} -> ${JSON.stringify(decoded.value)}`,
          ).toBe(true);
          // Decoded values are canonical: encoding them again gives the same bytes.
          const again = c.encode(decoded.value);
          expect(again.ok && [...again.value]).toEqual([...encoded.value]);
          expect(c.valueSchema.safeParse(v).success).toBe(true);
          expect(c.format(decoded.value).length).toBeGreaterThan(0);
        }),
        { numRuns: 300 },
      );
    });

    it("refuses a payload of the wrong length and a value of the wrong type", () => {
      const n = payloadOctets(c.sizeBits);
      const r = c.decode(new Uint8Array(n + 1));
      expect(r).toMatchObject({ ok: false, error: { kind: "dpt.payload-length", dpt: id } });
      if (!r.ok) expect(r.error.message).toContain(`${n} byte`);
      const wrong = c.encode(Symbol("not a value"));
      expect(wrong).toMatchObject({ ok: false, error: { kind: "dpt.wrong-type", dpt: id } });
    });

    if (payloadOctets(c.sizeBits) === 1) {
      it("decodes each of the 256 one-byte payloads to a value that re-encodes to it, or refuses it", () => {
        const offenders: string[] = [];
        for (let octet = 0; octet < 256; octet++) {
          const decoded = c.decode(Uint8Array.of(octet));
          if (!decoded.ok) {
            if (decoded.error.kind !== "dpt.out-of-range")
              offenders.push(`${octet}: ${decoded.error.kind}`);
            continue;
          }
          const again = c.encode(decoded.value);
          if (!again.ok || again.value[0] !== octet)
            offenders.push(`${octet} -> ${JSON.stringify(decoded.value)}`);
        }
        expect(offenders).toEqual([]);
      });
    }
  });
});
