import { err, ok, type Result } from "../core/result";
import {
  assertDataFrame,
  PRIORITY_BY_CODE,
  PRIORITY_CODES,
  SERVICE_APCI,
  tp1FrameOctets,
  type DataFrame,
  type GroupService,
} from "./data-frame";
import { frameError, type FrameDecodeError } from "./frame-decode-error";

/*
 * TP1 standard frame (knx-reference.md, "TP1 standard frame"; Basic course, TP1 conformance §10):
 *
 *   CTRL | SA hi | SA lo | DA hi | DA lo | AT·hop·LG | TPCI | APCI+data | data… | CHECK
 *
 * CTRL = 1 0 R 1 P P 0 0 (R = 1 when not repeated). LG counts the octets after the TPCI
 * octet, so a frame is 8 + LG octets. For group data the TPCI octet is 0b000000xx where
 * xx are the top two APCI bits (always 0 for the three group services).
 */

/** Fewest octets of a group-service frame: header, TPCI, APCI and check. */
export const MIN_TP1_FRAME_OCTETS = 9;
/** Most octets of a standard frame (LG = 15). */
export const MAX_TP1_FRAME_OCTETS = 23;

/** Check octet: NOT (XOR of all octets before it). */
export function tp1CheckOctet(bytes: Uint8Array, end: number): number {
  let x = 0;
  for (let i = 0; i < end; i++) x ^= bytes[i] as number;
  return ~x & 0xff;
}

/** Encodes a data frame as TP1 octets with its check octet. Throws on an invalid frame (a bug). */
export function encodeTp1Frame(frame: DataFrame): Uint8Array {
  assertDataFrame(frame);
  const bytes = new Uint8Array(tp1FrameOctets(frame));
  const lg = bytes.length - 8;
  bytes[0] = 0x90 | (frame.repeated ? 0 : 0x20) | (PRIORITY_CODES[frame.priority] << 2);
  bytes[1] = frame.source >>> 8;
  bytes[2] = frame.source & 0xff;
  bytes[3] = frame.destination >>> 8;
  bytes[4] = frame.destination & 0xff;
  bytes[5] = (frame.addressType === "group" ? 0x80 : 0) | (frame.hopCount << 4) | lg;
  const apci = SERVICE_APCI[frame.service];
  bytes[6] = apci >>> 8;
  bytes[7] = apci & 0xff;
  if (frame.shortPayload) {
    bytes[7] |= frame.payload[0] as number;
  } else {
    bytes.set(frame.payload, 8);
  }
  bytes[bytes.length - 1] = tp1CheckOctet(bytes, bytes.length - 1);
  return bytes;
}

/**
 * Decodes TP1 octets (check octet included) into a data frame. Refuses, with a typed
 * error, frames that are too short or long, whose length field disagrees with the
 * octets, whose check octet is wrong, or that are not a standard group-service frame.
 */
export function decodeTp1Frame(bytes: Uint8Array): Result<DataFrame, FrameDecodeError> {
  const n = bytes.length;
  if (n < MIN_TP1_FRAME_OCTETS) {
    return err(
      frameError("frame.truncated", `TP1 frame has ${n} octets; a group frame has at least 9`),
    );
  }
  if (n > MAX_TP1_FRAME_OCTETS) {
    return err(
      frameError("frame.length", `TP1 frame has ${n} octets; a standard frame has at most 23`),
    );
  }
  const lg = (bytes[5] as number) & 0x0f;
  if (8 + lg !== n) {
    const kind = 8 + lg > n ? "frame.truncated" : "frame.length";
    return err(
      frameError(
        kind,
        `TP1 length field says ${lg} octets after TPCI (frame of ${8 + lg}), got ${n} octets`,
      ),
    );
  }
  const check = tp1CheckOctet(bytes, n - 1);
  if (check !== bytes[n - 1]) {
    return err(
      frameError(
        "frame.checksum",
        `TP1 check octet is 0x${hex2(bytes[n - 1] as number)}, expected 0x${hex2(check)}`,
      ),
    );
  }
  const ctrl = bytes[0] as number;
  // 1 0 R 1 P P 0 0: anything else is an extended frame, a poll frame or noise.
  if ((ctrl & 0xd3) !== 0x90) {
    return err(
      frameError("frame.service", `TP1 control octet 0x${hex2(ctrl)} is not a standard data frame`),
    );
  }
  return buildFrame(bytes, ctrl, lg);
}

function buildFrame(
  bytes: Uint8Array,
  ctrl: number,
  lg: number,
): Result<DataFrame, FrameDecodeError> {
  const tpdu = decodeGroupTpdu(bytes, 6, lg);
  if (!tpdu.ok) return tpdu;
  const npci = bytes[5] as number;
  return ok({
    priority: PRIORITY_BY_CODE[(ctrl >>> 2) & 0x03] as DataFrame["priority"],
    repeated: (ctrl & 0x20) === 0,
    source: ((bytes[1] as number) << 8) | (bytes[2] as number),
    destination: ((bytes[3] as number) << 8) | (bytes[4] as number),
    addressType: npci & 0x80 ? "group" : "individual",
    hopCount: (npci >>> 4) & 0x07,
    service: tpdu.value.service,
    payload: tpdu.value.payload,
    shortPayload: tpdu.value.shortPayload,
  });
}

export interface GroupTpdu {
  readonly service: GroupService;
  readonly payload: Uint8Array;
  readonly shortPayload: boolean;
}

/**
 * Decodes the TPCI octet at `at` and the `lg` octets after it (APCI and data) into a
 * group service and its payload. Shared by TP1 and cEMI, whose TPDUs are identical.
 */
export function decodeGroupTpdu(
  bytes: Uint8Array,
  at: number,
  lg: number,
): Result<GroupTpdu, FrameDecodeError> {
  if (lg < 1) {
    return err(
      frameError("frame.service", "frame carries no APCI (length 0): not a group service"),
    );
  }
  const tpci = bytes[at] as number;
  // T_Data_Group / T_Data_Individual: data, unnumbered, sequence 0. Connection-oriented
  // and control TPDUs are not modelled.
  if ((tpci & 0xfc) !== 0) {
    return err(frameError("frame.service", `TPCI 0x${hex2(tpci)} is not an unnumbered data TPDU`));
  }
  const apciOctet = bytes[at + 1] as number;
  const apci = ((tpci & 0x03) << 8) | (apciOctet & 0xc0);
  const service = serviceOf(apci);
  if (service === undefined) {
    return err(
      frameError(
        "frame.service",
        `APCI 0x${apci.toString(16).padStart(3, "0").toUpperCase()} is not a group service`,
      ),
    );
  }
  const lowBits = apciOctet & 0x3f;
  if (service === "GroupValue_Read") {
    if (lg !== 1 || lowBits !== 0) {
      return err(
        frameError("frame.length", "GroupValue_Read carries no data, but the frame has data"),
      );
    }
    return ok({ service, payload: new Uint8Array(0), shortPayload: false });
  }
  if (lg === 1) {
    const payload = new Uint8Array(1);
    payload[0] = lowBits;
    return ok({ service, payload, shortPayload: true });
  }
  if (lowBits !== 0) {
    // knx-reference.md: with data after the APCI octet, its data bits are 0.
    return err(
      frameError(
        "frame.service",
        `APCI octet 0x${hex2(apciOctet)} has data bits set although data follows it`,
      ),
    );
  }
  return ok({ service, payload: bytes.slice(at + 2, at + 1 + lg), shortPayload: false });
}

function serviceOf(apci: number): GroupService | undefined {
  if (apci === 0x000) return "GroupValue_Read";
  if (apci === 0x040) return "GroupValue_Response";
  if (apci === 0x080) return "GroupValue_Write";
  return undefined;
}

function hex2(octet: number): string {
  return octet.toString(16).toUpperCase().padStart(2, "0");
}
