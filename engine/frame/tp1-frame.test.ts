import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { DataFrame } from "./data-frame";
import { toHex } from "./hex";
import { decodeTp1Frame, encodeTp1Frame } from "./tp1-frame";
import { dataFrameArbitrary, hexBytes, workedFrame } from "../../test/harness/frame-fixtures";

describe("TP1 frames, reference vectors", () => {
  it("encodes the workedFrame frame: 1.1.1 writes ON to 1/0/1", () => {
    // Basic course / knx-reference.md: BC 11 01 08 01 E1 00 81 3A.
    expect(toHex(encodeTp1Frame(workedFrame))).toBe("BC 11 01 08 01 E1 00 81 3A");
    expect(decodeTp1Frame(hexBytes("BC 11 01 08 01 E1 00 81 3A"))).toEqual({
      ok: true,
      value: workedFrame,
    });
  });

  it("puts priority and the repeat flag in the control octet", () => {
    // knx-reference.md TP1 standard frame: system 0xB0, urgent 0xB8, normal 0xB4, low 0xBC; R = 0 on a repetition.
    const ctrl = (f: Partial<DataFrame>) => encodeTp1Frame({ ...workedFrame, ...f })[0];
    expect(ctrl({ priority: "system" })).toBe(0xb0);
    expect(ctrl({ priority: "urgent" })).toBe(0xb8);
    expect(ctrl({ priority: "normal" })).toBe(0xb4);
    expect(ctrl({ priority: "low" })).toBe(0xbc);
    expect(ctrl({ priority: "low", repeated: true })).toBe(0x9c);
  });

  it("codes read, response and write in the APCI", () => {
    // knx-reference.md: GroupValue_Read 0x000, GroupValue_Response 0x040, GroupValue_Write 0x080.
    const read = encodeTp1Frame({
      ...workedFrame,
      service: "GroupValue_Read",
      payload: new Uint8Array(0),
      shortPayload: false,
    });
    expect(toHex(read.subarray(5, 8))).toBe("E1 00 00");
    const response = encodeTp1Frame({
      ...workedFrame,
      service: "GroupValue_Response",
      payload: Uint8Array.of(0),
    });
    expect(toHex(response.subarray(5, 8))).toBe("E1 00 40");
  });

  it("sends data of one octet or more after the APCI octet", () => {
    // DPT spec §1.3.1: data of an octet or more follows the APCI octet, whose data bits are 0.
    // 21.00 °C as DPT 9.001 is 0C 1A (DPT spec §3.10); LG = 3 -> NPCI 0xE3.
    const frame: DataFrame = {
      ...workedFrame,
      payload: Uint8Array.of(0x0c, 0x1a),
      shortPayload: false,
    };
    const encoded = encodeTp1Frame(frame);
    expect(encoded.length).toBe(11);
    expect(toHex(encoded.subarray(5, 10))).toBe("E3 00 80 0C 1A");
    expect(decodeTp1Frame(encoded)).toEqual({ ok: true, value: frame });
  });

  it("throws when asked to encode an impossible frame (a bug in the caller)", () => {
    expect(() => encodeTp1Frame({ ...workedFrame, hopCount: 8 })).toThrow(/hopCount/);
    expect(() => encodeTp1Frame({ ...workedFrame, payload: Uint8Array.of(0x40) })).toThrow(/short/);
    expect(() =>
      encodeTp1Frame({ ...workedFrame, shortPayload: false, payload: new Uint8Array(15) }),
    ).toThrow(/1\.\.14/);
    expect(() => encodeTp1Frame({ ...workedFrame, source: 0x10000 })).toThrow(/source/);
  });
});

describe("TP1 frames, refusing bad bytes", () => {
  const cases: [string, string, string][] = [
    ["bad check octet", "BC 11 01 08 01 E1 00 81 3B", "frame.checksum"],
    ["too short", "BC 11 01 08 01 E1 00", "frame.truncated"],
    ["too long for a standard frame", "BC 11 01 08 01 EF 00 80" + " 00".repeat(16), "frame.length"],
    ["length field larger than the octets", "BC 11 01 08 01 E2 00 81 39", "frame.truncated"],
    ["length field smaller than the octets", "BC 11 01 08 01 E1 00 80 0C 1A 3B", "frame.length"],
    ["unknown APCI (0x0C0)", "BC 11 01 08 01 E1 00 C1 7A", "frame.service"],
    ["connection-oriented TPCI", "BC 11 01 08 01 E1 80 81 BA", "frame.service"],
    ["extended frame control octet", "3C 11 01 08 01 E1 00 81 9A", "frame.service"],
  ];
  for (const [what, hex, kind] of cases) {
    it(`refuses a frame with ${what}`, () => {
      const b = hexBytes(hex);
      // Fix the check octet of the deliberately wrong frames so the intended fault is what is found.
      if (kind !== "frame.checksum" && kind !== "frame.truncated") {
        let x = 0;
        for (let i = 0; i < b.length - 1; i++) x ^= b[i] as number;
        b[b.length - 1] = ~x & 0xff;
      }
      const r = decodeTp1Frame(b);
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.error.kind).toBe(kind);
        expect(r.error.message.length).toBeGreaterThan(10);
      }
    });
  }
});

describe("TP1 frame properties", () => {
  it("round-trips every valid frame", () => {
    fc.assert(
      fc.property(dataFrameArbitrary, (frame) => {
        expect(decodeTp1Frame(encodeTp1Frame(frame))).toEqual({ ok: true, value: frame });
      }),
      { numRuns: 2000 },
    );
  });

  it("catches any single-byte corruption", () => {
    // Basic course: check octet = NOT XOR of the preceding octets, so any change of one octet changes it.
    fc.assert(
      fc.property(
        dataFrameArbitrary,
        fc.nat(),
        fc.integer({ min: 1, max: 255 }),
        (frame, at, flip) => {
          const encoded = encodeTp1Frame(frame);
          const i = at % encoded.length;
          encoded[i] = (encoded[i] as number) ^ flip;
          expect(decodeTp1Frame(encoded).ok).toBe(false);
        },
      ),
      { numRuns: 5000 },
    );
  });
});
