import { describe, expect, it } from "vitest";
import { workedFrame } from "../../test/harness/frame-fixtures";
import { describeTelegram } from "./describe-telegram";

describe("describeTelegram", () => {
  it("describes the worked frame with its DPT value and raw hex", () => {
    // Basic course worked frame: 1.1.1 writes ON to 1/0/1 = BC 11 01 08 01 E1 00 81 3A.
    expect(describeTelegram(workedFrame, { dpt: "1.001", groupAddressName: "Hall light" })).toEqual(
      {
        source: "1.1.1",
        destination: "1/0/1",
        destinationName: "Hall light",
        service: "GroupValue_Write",
        priority: "low",
        repeated: false,
        dpt: "1.001",
        value: "On",
        payloadHex: "01",
        rawHex: "BC 11 01 08 01 E1 00 81 3A",
        text: "1.1.1 -> 1/0/1 Hall light: GroupValue_Write On",
      },
    );
  });

  it("decodes a temperature response and shows the unit", () => {
    // DPT spec §3.10: 0C 1A is 21.00 °C.
    const d = describeTelegram(
      {
        ...workedFrame,
        service: "GroupValue_Response",
        payload: Uint8Array.of(0x0c, 0x1a),
        shortPayload: false,
      },
      { dpt: "9.001", groupAddressStyle: "two-level" },
    );
    expect(d.value).toBe("21.00 °C");
    expect(d.text).toBe("1.1.1 -> 1/1: GroupValue_Response 21.00 °C");
    expect(d.payloadHex).toBe("0C 1A");
  });

  it("shows reads without a value, raw payload without a DPT, and a decode problem", () => {
    const read = describeTelegram({
      ...workedFrame,
      service: "GroupValue_Read",
      payload: new Uint8Array(0),
      shortPayload: false,
    });
    expect(read.text).toBe("1.1.1 -> 1/0/1: GroupValue_Read");
    expect(read.value).toBeUndefined();
    expect(describeTelegram({ ...workedFrame, repeated: true }).text).toBe(
      "1.1.1 -> 1/0/1: GroupValue_Write 01 (repeated)",
    );
    const wrong = describeTelegram(workedFrame, { dpt: "9.001" });
    expect(wrong.valueError).toBe("9.001: payload must be 2 bytes, got 1");
    expect(wrong.text).toBe("1.1.1 -> 1/0/1: GroupValue_Write 01");
    expect(describeTelegram(workedFrame, { dpt: "99.001" }).valueError).toBe("unknown DPT 99.001");
    const individual = describeTelegram({
      ...workedFrame,
      addressType: "individual",
      destination: 0x110a,
    });
    expect(individual.destination).toBe("1.1.10");
  });
});
