import fc from "fast-check";
import type { DataFrame } from "../../engine";
import { fromHex } from "../../engine";

/*
 * Shared fixtures for frame tests (TP1 and cEMI): one generator of valid frames
 * and the worked frame of the Basic course, so both codecs are checked against
 * the same inputs.
 */

/** Any frame the engine may build: reads, short payloads (0..0x3F) and long ones (1..14 octets). */
export const dataFrameArbitrary: fc.Arbitrary<DataFrame> = fc
  .record({
    priority: fc.constantFrom("system", "normal", "urgent", "low"),
    repeated: fc.boolean(),
    source: fc.integer({ min: 0, max: 0xffff }),
    destination: fc.integer({ min: 0, max: 0xffff }),
    addressType: fc.constantFrom("group", "individual"),
    hopCount: fc.integer({ min: 0, max: 7 }),
    kind: fc.oneof(
      fc.constant({
        service: "GroupValue_Read" as const,
        payload: new Uint8Array(0),
        shortPayload: false,
      }),
      fc.record({
        service: fc.constantFrom("GroupValue_Response" as const, "GroupValue_Write" as const),
        payload: fc.integer({ min: 0, max: 0x3f }).map((v) => Uint8Array.of(v)),
        shortPayload: fc.constant(true),
      }),
      fc.record({
        service: fc.constantFrom("GroupValue_Response" as const, "GroupValue_Write" as const),
        payload: fc.uint8Array({ minLength: 1, maxLength: 14 }),
        shortPayload: fc.constant(false),
      }),
    ),
  })
  .map(({ kind, ...rest }) => ({ ...rest, ...kind }));

/** Basic course / knx-reference.md: 1.1.1 writes ON to 1/0/1 at low priority. */
export const workedFrame: DataFrame = {
  priority: "low",
  repeated: false,
  source: 0x1101,
  destination: 0x0801,
  addressType: "group",
  hopCount: 6,
  service: "GroupValue_Write",
  payload: Uint8Array.of(1),
  shortPayload: true,
};

/** Hex text to bytes; throws on bad hex (a broken fixture). */
export function hexBytes(text: string): Uint8Array {
  const b = fromHex(text);
  if (b === undefined) throw new Error(`bad hex ${text}`);
  return b;
}
