import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { decodeCemi, encodeCemi, type CemiLData } from "./cemi";
import { toHex } from "./hex";
import { dataFrameArbitrary, hexBytes, workedFrame } from "../../test/harness/frame-fixtures";

describe("cEMI L_Data", () => {
  it("carries the workedFrame frame as L_Data.ind", () => {
    // knx-reference.md cEMI layout + message code 0x29, with the Basic course workedFrame frame's
    // fields (1.1.1 writes ON to 1/0/1); Ctrl1 0xBC / Ctrl2 0xE0 recalled from memory.
    const encoded = encodeCemi({ messageCode: "L_Data.ind", frame: workedFrame });
    expect(toHex(encoded)).toBe("29 00 BC E0 11 01 08 01 01 00 81");
    expect(decodeCemi(encoded)).toEqual({
      ok: true,
      value: {
        messageCode: "L_Data.ind",
        frame: workedFrame,
        additionalInfo: new Uint8Array(0),
        ackRequest: false,
        confirmError: false,
      },
    });
  });

  it("uses the message codes of the reference", () => {
    // knx-reference.md: L_Data.req 0x11, L_Data.con 0x2E, L_Data.ind 0x29.
    expect(encodeCemi({ messageCode: "L_Data.req", frame: workedFrame })[0]).toBe(0x11);
    expect(
      encodeCemi({ messageCode: "L_Data.con", frame: workedFrame, confirmError: true })[0],
    ).toBe(0x2e);
    // Long data follows the APCI octet: 21.00 °C as 9.001 is 0C 1A (DPT spec §3.10).
    const long = encodeCemi({
      messageCode: "L_Data.req",
      frame: { ...workedFrame, payload: Uint8Array.of(0x0c, 0x1a), shortPayload: false },
    });
    expect(toHex(long)).toBe("11 00 BC E0 11 01 08 01 03 00 80 0C 1A");
  });

  it("refuses bad messages with a typed error", () => {
    const cases: [string, string][] = [
      ["2B 00 BC E0 11 01 08 01 01 00 81", "frame.service"], // L_Busmon.ind is not L_Data
      ["29 00 BC E0 11 01 08", "frame.truncated"],
      ["29 00 BC E0 11 01 08 01 02 00 81", "frame.truncated"],
      ["29 00 BC E0 11 01 08 01 01 00 81 00", "frame.length"],
      ["29 00 3C E0 11 01 08 01 01 00 81", "frame.service"], // extended frame
      ["29 00 BC E0 11 01 08 01 01 00 C1", "frame.service"], // APCI 0x0C0
      ["29 05 BC E0", "frame.truncated"],
    ];
    for (const [hex, kind] of cases) {
      const r = decodeCemi(hexBytes(hex));
      expect(r.ok, hex).toBe(false);
      if (!r.ok) expect(r.error.kind, hex).toBe(kind);
    }
  });

  it("round-trips arbitrary messages", () => {
    const message: fc.Arbitrary<CemiLData> = fc.record({
      messageCode: fc.constantFrom("L_Data.req", "L_Data.con", "L_Data.ind"),
      frame: dataFrameArbitrary,
      additionalInfo: fc.uint8Array({ maxLength: 8 }),
      ackRequest: fc.boolean(),
      confirmError: fc.boolean(),
    });
    fc.assert(
      fc.property(message, (m) => {
        expect(decodeCemi(encodeCemi(m))).toEqual({ ok: true, value: m });
      }),
      { numRuns: 2000 },
    );
  });
});
