/**
 * A standard data frame carrying a group service, independent of the medium:
 * TP1 (tp1-frame.ts) and cEMI (cemi.ts) both encode and decode this shape.
 */

/** Frame priority; lower codes win arbitration (system 00 < normal 01 < urgent 10 < low 11). */
export type Priority = "system" | "normal" | "urgent" | "low";

/** The group services the engine models (APCI 0x000, 0x040, 0x080). */
export type GroupService = "GroupValue_Read" | "GroupValue_Response" | "GroupValue_Write";

export interface DataFrame {
  readonly priority: Priority;
  /** True on a repetition (control bit R = 0 on the wire). */
  readonly repeated: boolean;
  /** Raw individual address of the sender. */
  readonly source: number;
  /** Raw group address, or raw individual address when `addressType` is "individual". */
  readonly destination: number;
  readonly addressType: "group" | "individual";
  /** Routing counter 0..7; devices send 6. */
  readonly hopCount: number;
  readonly service: GroupService;
  /** Empty for a read; 1 byte for short (<= 6 bit) data packed in the APCI octet; else the data octets (1..14). */
  readonly payload: Uint8Array;
  /** True when the payload travels in the low 6 bits of the APCI octet. */
  readonly shortPayload: boolean;
}

/** Hop count devices send with (knx-reference.md, TP1 standard frame). */
export const DEFAULT_HOP_COUNT = 6;

/** Longest payload after the APCI octet in a standard frame: length field 15 minus the APCI octet. */
export const MAX_LONG_PAYLOAD_OCTETS = 14;

/** Priority codes as they sit in control-field bits 3-2. */
export const PRIORITY_CODES: Readonly<Record<Priority, number>> = {
  system: 0b00,
  normal: 0b01,
  urgent: 0b10,
  low: 0b11,
};

export const PRIORITY_BY_CODE: readonly Priority[] = ["system", "normal", "urgent", "low"];

/** APCI of each group service (10-bit value, data bits zero). */
export const SERVICE_APCI: Readonly<Record<GroupService, number>> = {
  GroupValue_Read: 0x000,
  GroupValue_Response: 0x040,
  GroupValue_Write: 0x080,
};

/**
 * Octets of the TP1 frame for `frame`, check octet included: 9 for a read or short
 * payload (the Basic course's 1-bit write), 9 + payload length otherwise.
 */
export function tp1FrameOctets(frame: Pick<DataFrame, "payload" | "shortPayload">): number {
  return 9 + (frame.shortPayload ? 0 : frame.payload.length);
}

/**
 * Checks a frame built inside the engine. A bad frame here is a bug in the caller,
 * so it throws with the field named rather than returning a Result.
 */
export function assertDataFrame(frame: DataFrame): void {
  const { source, destination, hopCount, payload, shortPayload, service } = frame;
  if (!Number.isInteger(source) || source < 0 || source > 0xffff) {
    throw new RangeError(`frame.source ${source} is not a 16-bit address`);
  }
  if (!Number.isInteger(destination) || destination < 0 || destination > 0xffff) {
    throw new RangeError(`frame.destination ${destination} is not a 16-bit address`);
  }
  if (!Number.isInteger(hopCount) || hopCount < 0 || hopCount > 7) {
    throw new RangeError(`frame.hopCount ${hopCount} is not in 0..7`);
  }
  if (!(frame.priority in PRIORITY_CODES)) {
    throw new RangeError(`frame.priority "${String(frame.priority)}" is not a priority`);
  }
  if (!(service in SERVICE_APCI)) {
    throw new RangeError(`frame.service "${String(service)}" is not a group service`);
  }
  if (service === "GroupValue_Read") {
    if (payload.length !== 0 || shortPayload) {
      throw new RangeError("frame.payload must be empty and short=false for GroupValue_Read");
    }
    return;
  }
  if (shortPayload) {
    if (payload.length !== 1 || (payload[0] as number) > 0x3f) {
      throw new RangeError("frame.payload of a short frame must be one byte in 0..0x3F");
    }
  } else if (payload.length < 1 || payload.length > MAX_LONG_PAYLOAD_OCTETS) {
    throw new RangeError(`frame.payload has ${payload.length} octets; a long payload has 1..14`);
  }
}
