import { err, ok, type Result } from "../core/result";
import {
  assertDataFrame,
  PRIORITY_BY_CODE,
  PRIORITY_CODES,
  SERVICE_APCI,
  type DataFrame,
} from "./data-frame";
import { frameError, type FrameDecodeError } from "./frame-decode-error";
import { decodeGroupTpdu } from "./tp1-frame";

/*
 * cEMI L_Data messages (knx-reference.md, "cEMI and KNXnet/IP"):
 *
 *   code | addIL | addInfo… | Ctrl1 | Ctrl2 | SA hi | SA lo | DA hi | DA lo | length | TPCI | APCI+data | data…
 *
 * Message codes L_Data.req 0x11, L_Data.con 0x2E, L_Data.ind 0x29. `length` counts
 * the octets after TPCI, like the TP1 length field. The Ctrl1 bit layout below is
 * recalled from memory: it mirrors the TP1 control octet (frame type, repeat,
 * broadcast, priority) and adds the acknowledge-request and confirm bits, so a
 * low-priority group telegram has Ctrl1 0xBC as on TP1.
 *   Ctrl1: 7 standard frame (1) | 6 reserved 0 | 5 R (1 = not repeated) | 4 broadcast (1)
 *          | 3-2 priority | 1 acknowledge requested | 0 confirm error (L_Data.con)
 *   Ctrl2: 7 address type (1 group) | 6-4 hop count | 3-0 extended frame format (0)
 */

export type CemiMessageCode = "L_Data.req" | "L_Data.con" | "L_Data.ind";

export const CEMI_MESSAGE_CODES: Readonly<Record<CemiMessageCode, number>> = {
  "L_Data.req": 0x11,
  "L_Data.con": 0x2e,
  "L_Data.ind": 0x29,
};

/** A cEMI L_Data message carrying one data frame. */
export interface CemiLData {
  readonly messageCode: CemiMessageCode;
  readonly frame: DataFrame;
  /** Additional-information block, passed through untouched (empty when none). */
  readonly additionalInfo: Uint8Array;
  /** The sender asks for a link-layer acknowledgement. */
  readonly ackRequest: boolean;
  /** On L_Data.con: true when the frame was not delivered. */
  readonly confirmError: boolean;
}

/** The input of `encodeCemi`: optional fields default to empty / false. */
export type CemiLDataInput = Pick<CemiLData, "messageCode" | "frame"> & Partial<CemiLData>;

/** Encodes a cEMI L_Data message. Throws on an invalid frame (a bug in the caller). */
export function encodeCemi(message: CemiLDataInput): Uint8Array {
  const { frame } = message;
  assertDataFrame(frame);
  const info = message.additionalInfo ?? new Uint8Array(0);
  if (info.length > 255) throw new RangeError("cemi.additionalInfo is longer than 255 octets");
  const lg = 1 + (frame.shortPayload ? 0 : frame.payload.length);
  const at = 2 + info.length;
  const bytes = new Uint8Array(at + 8 + lg);
  bytes[0] = CEMI_MESSAGE_CODES[message.messageCode];
  bytes[1] = info.length;
  bytes.set(info, 2);
  bytes[at] =
    0x90 |
    (frame.repeated ? 0 : 0x20) |
    (PRIORITY_CODES[frame.priority] << 2) |
    (message.ackRequest ? 0x02 : 0) |
    (message.confirmError ? 0x01 : 0);
  bytes[at + 1] = (frame.addressType === "group" ? 0x80 : 0) | (frame.hopCount << 4);
  bytes[at + 2] = frame.source >>> 8;
  bytes[at + 3] = frame.source & 0xff;
  bytes[at + 4] = frame.destination >>> 8;
  bytes[at + 5] = frame.destination & 0xff;
  bytes[at + 6] = lg;
  const apci = SERVICE_APCI[frame.service];
  bytes[at + 7] = apci >>> 8;
  bytes[at + 8] = (apci & 0xff) | (frame.shortPayload ? (frame.payload[0] as number) : 0);
  if (!frame.shortPayload) bytes.set(frame.payload, at + 9);
  return bytes;
}

/** Decodes a cEMI L_Data message; other message codes and extended frames are refused. */
export function decodeCemi(bytes: Uint8Array): Result<CemiLData, FrameDecodeError> {
  if (bytes.length < 2)
    return err(frameError("frame.truncated", `cEMI message has ${bytes.length} octets; too short`));
  const code = bytes[0] as number;
  const messageCode = (Object.keys(CEMI_MESSAGE_CODES) as CemiMessageCode[]).find(
    (k) => CEMI_MESSAGE_CODES[k] === code,
  );
  if (messageCode === undefined) {
    return err(
      frameError("frame.service", `cEMI message code 0x${hex2(code)} is not L_Data.req/.con/.ind`),
    );
  }
  const at = 2 + (bytes[1] as number);
  if (bytes.length < at + 9) {
    return err(
      frameError(
        "frame.truncated",
        `cEMI ${messageCode} has ${bytes.length} octets; at least ${at + 9} needed`,
      ),
    );
  }
  const lg = bytes[at + 6] as number;
  if (bytes.length !== at + 8 + lg) {
    const kind = bytes.length < at + 8 + lg ? "frame.truncated" : "frame.length";
    return err(
      frameError(
        kind,
        `cEMI length field says ${lg} octets after TPCI, got ${bytes.length - at - 8}`,
      ),
    );
  }
  if (lg > 15)
    return err(frameError("frame.length", `cEMI length ${lg} is beyond a standard frame's 15`));
  const ctrl1 = bytes[at] as number;
  const ctrl2 = bytes[at + 1] as number;
  if ((ctrl1 & 0xd0) !== 0x90 || (ctrl2 & 0x0f) !== 0) {
    return err(
      frameError(
        "frame.service",
        `cEMI control 0x${hex2(ctrl1)} 0x${hex2(ctrl2)} is not a standard frame`,
      ),
    );
  }
  const tpdu = decodeGroupTpdu(bytes, at + 7, lg);
  if (!tpdu.ok) return tpdu;
  return ok({
    messageCode,
    additionalInfo: bytes.slice(2, at),
    ackRequest: (ctrl1 & 0x02) !== 0,
    confirmError: (ctrl1 & 0x01) !== 0,
    frame: {
      priority: PRIORITY_BY_CODE[(ctrl1 >>> 2) & 0x03] as DataFrame["priority"],
      repeated: (ctrl1 & 0x20) === 0,
      source: ((bytes[at + 2] as number) << 8) | (bytes[at + 3] as number),
      destination: ((bytes[at + 4] as number) << 8) | (bytes[at + 5] as number),
      addressType: ctrl2 & 0x80 ? "group" : "individual",
      hopCount: (ctrl2 >>> 4) & 0x07,
      service: tpdu.value.service,
      payload: tpdu.value.payload,
      shortPayload: tpdu.value.shortPayload,
    },
  });
}

function hex2(octet: number): string {
  return octet.toString(16).toUpperCase().padStart(2, "0");
}
