import { err, ok, type Result } from "../core/result";
import { HEADER_LENGTH, PROTOCOL_VERSION, SERVICE_TYPES, type ServiceName } from "./constants";
import {
  connectionInfoLength,
  readConnectionInfo,
  writeConnectionInfo,
  type Crd,
  type Cri,
} from "./connection-info";
import { decodeError, hex, type KnxNetIpDecodeError } from "./decode-error";
import { dibLength, readDibs, writeDib, type Dib } from "./dib";
import { HPAI_LENGTH, readHpai, writeHpai, type Hpai } from "./hpai";

/**
 * KNXnet/IP frames of the core and tunnelling services as values, and their
 * encoding (KNXnet/IP spec, Core §2.3 and §7.5-7.8, Tunnelling §4.4):
 *
 *   header: 0x06 | 0x10 | service type (2) | total length (2, header included)
 *
 *   SEARCH_REQUEST            HPAI discovery endpoint
 *   SEARCH_RESPONSE           HPAI control endpoint | DIB device info | DIB service families
 *   DESCRIPTION_REQUEST       HPAI control endpoint
 *   DESCRIPTION_RESPONSE      DIB device info | DIB service families | further DIBs
 *   CONNECT_REQUEST           HPAI control endpoint | HPAI data endpoint | CRI
 *   CONNECT_RESPONSE          channel id | status | (HPAI data endpoint | CRD, when status is E_NO_ERROR)
 *   CONNECTIONSTATE_REQUEST   channel id | reserved | HPAI control endpoint
 *   CONNECTIONSTATE_RESPONSE  channel id | status
 *   DISCONNECT_REQUEST        channel id | reserved | HPAI control endpoint
 *   DISCONNECT_RESPONSE       channel id | status
 *   TUNNELLING_REQUEST        connection header (0x04 | channel id | sequence counter | reserved) | cEMI
 *   TUNNELLING_ACK            connection header (0x04 | channel id | sequence counter | status)
 *
 * The cEMI message of a tunnelling request stays octets here: a tunnel may
 * carry message codes the engine's cEMI code does not model, and the server
 * decides what to do with them (engine/frame/cemi.ts decodes L_Data).
 */
export type KnxNetIpFrame =
  | { readonly service: "SEARCH_REQUEST"; readonly discoveryEndpoint: Hpai }
  | {
      readonly service: "SEARCH_RESPONSE";
      readonly controlEndpoint: Hpai;
      readonly dibs: readonly Dib[];
    }
  | { readonly service: "DESCRIPTION_REQUEST"; readonly controlEndpoint: Hpai }
  | { readonly service: "DESCRIPTION_RESPONSE"; readonly dibs: readonly Dib[] }
  | {
      readonly service: "CONNECT_REQUEST";
      readonly controlEndpoint: Hpai;
      readonly dataEndpoint: Hpai;
      readonly cri: Cri;
    }
  | {
      readonly service: "CONNECT_RESPONSE";
      readonly channelId: number;
      readonly status: number;
      /** Present when the connection was granted (status E_NO_ERROR). */
      readonly granted?: { readonly dataEndpoint: Hpai; readonly crd: Crd };
    }
  | {
      readonly service: "CONNECTIONSTATE_REQUEST" | "DISCONNECT_REQUEST";
      readonly channelId: number;
      readonly controlEndpoint: Hpai;
    }
  | {
      readonly service: "CONNECTIONSTATE_RESPONSE" | "DISCONNECT_RESPONSE";
      readonly channelId: number;
      readonly status: number;
    }
  | {
      readonly service: "TUNNELLING_REQUEST";
      readonly channelId: number;
      readonly sequenceCounter: number;
      readonly cemi: Uint8Array;
    }
  | {
      readonly service: "TUNNELLING_ACK";
      readonly channelId: number;
      readonly sequenceCounter: number;
      readonly status: number;
    };

/** The frame type of one service. */
export type FrameOf<S extends ServiceName> = Extract<KnxNetIpFrame, { service: S }>;

const CONNECTION_HEADER_LENGTH = 4;
const SERVICE_BY_CODE = new Map<number, ServiceName>(
  (Object.keys(SERVICE_TYPES) as ServiceName[]).map((name) => [SERVICE_TYPES[name], name]),
);

/** Octets after the header. */
function bodyLength(frame: KnxNetIpFrame): number {
  switch (frame.service) {
    case "SEARCH_REQUEST":
    case "DESCRIPTION_REQUEST":
      return HPAI_LENGTH;
    case "SEARCH_RESPONSE":
      return HPAI_LENGTH + sumDibs(frame.dibs);
    case "DESCRIPTION_RESPONSE":
      return sumDibs(frame.dibs);
    case "CONNECT_REQUEST":
      return 2 * HPAI_LENGTH + connectionInfoLength(frame.cri);
    case "CONNECT_RESPONSE":
      return (
        2 +
        (frame.granted === undefined ? 0 : HPAI_LENGTH + connectionInfoLength(frame.granted.crd))
      );
    case "CONNECTIONSTATE_REQUEST":
    case "DISCONNECT_REQUEST":
      return 2 + HPAI_LENGTH;
    case "CONNECTIONSTATE_RESPONSE":
    case "DISCONNECT_RESPONSE":
      return 2;
    case "TUNNELLING_REQUEST":
      return CONNECTION_HEADER_LENGTH + frame.cemi.length;
    case "TUNNELLING_ACK":
      return CONNECTION_HEADER_LENGTH;
  }
}

function sumDibs(dibs: readonly Dib[]): number {
  let total = 0;
  for (const dib of dibs) total += dibLength(dib);
  return total;
}

/** Encodes a frame, header included. Throws on a field out of range (a bug in the caller). */
export function encodeKnxNetIpFrame(frame: KnxNetIpFrame): Uint8Array {
  const total = HEADER_LENGTH + bodyLength(frame);
  if (total > 0xffff) throw new RangeError(`KNXnet/IP frame of ${total} octets is too long`);
  const bytes = new Uint8Array(total);
  const code = SERVICE_TYPES[frame.service];
  bytes[0] = HEADER_LENGTH;
  bytes[1] = PROTOCOL_VERSION;
  bytes[2] = code >>> 8;
  bytes[3] = code & 0xff;
  bytes[4] = total >>> 8;
  bytes[5] = total & 0xff;
  const at = HEADER_LENGTH;
  switch (frame.service) {
    case "SEARCH_REQUEST":
      writeHpai(bytes, at, frame.discoveryEndpoint);
      break;
    case "DESCRIPTION_REQUEST":
      writeHpai(bytes, at, frame.controlEndpoint);
      break;
    case "SEARCH_RESPONSE":
      writeHpai(bytes, at, frame.controlEndpoint);
      writeDibs(bytes, at + HPAI_LENGTH, frame.dibs);
      break;
    case "DESCRIPTION_RESPONSE":
      writeDibs(bytes, at, frame.dibs);
      break;
    case "CONNECT_REQUEST":
      writeHpai(bytes, at, frame.controlEndpoint);
      writeHpai(bytes, at + HPAI_LENGTH, frame.dataEndpoint);
      writeConnectionInfo(bytes, at + 2 * HPAI_LENGTH, frame.cri);
      break;
    case "CONNECT_RESPONSE":
      bytes[at] = octet(frame.channelId, "channelId");
      bytes[at + 1] = octet(frame.status, "status");
      if (frame.granted !== undefined) {
        writeHpai(bytes, at + 2, frame.granted.dataEndpoint);
        writeConnectionInfo(bytes, at + 2 + HPAI_LENGTH, frame.granted.crd);
      }
      break;
    case "CONNECTIONSTATE_REQUEST":
    case "DISCONNECT_REQUEST":
      bytes[at] = octet(frame.channelId, "channelId");
      bytes[at + 1] = 0;
      writeHpai(bytes, at + 2, frame.controlEndpoint);
      break;
    case "CONNECTIONSTATE_RESPONSE":
    case "DISCONNECT_RESPONSE":
      bytes[at] = octet(frame.channelId, "channelId");
      bytes[at + 1] = octet(frame.status, "status");
      break;
    case "TUNNELLING_REQUEST":
      bytes[at] = CONNECTION_HEADER_LENGTH;
      bytes[at + 1] = octet(frame.channelId, "channelId");
      bytes[at + 2] = octet(frame.sequenceCounter, "sequenceCounter");
      bytes[at + 3] = 0;
      bytes.set(frame.cemi, at + CONNECTION_HEADER_LENGTH);
      break;
    case "TUNNELLING_ACK":
      bytes[at] = CONNECTION_HEADER_LENGTH;
      bytes[at + 1] = octet(frame.channelId, "channelId");
      bytes[at + 2] = octet(frame.sequenceCounter, "sequenceCounter");
      bytes[at + 3] = octet(frame.status, "status");
      break;
  }
  return bytes;
}

function writeDibs(bytes: Uint8Array, at: number, dibs: readonly Dib[]): void {
  let offset = at;
  for (const dib of dibs) {
    writeDib(bytes, offset, dib);
    offset += dibLength(dib);
  }
}

function octet(value: number, field: string): number {
  if (!Number.isInteger(value) || value < 0 || value > 0xff)
    throw new RangeError(`knxnetip.${field} ${value} is not an octet`);
  return value;
}

/** The service type code and total length of a header, checked against the octets. */
export interface KnxNetIpHeader {
  readonly serviceType: number;
  readonly totalLength: number;
}

/** Reads and checks the 6-octet header: length 0x06, version 0x10, total length equal to the octets. */
export function decodeHeader(bytes: Uint8Array): Result<KnxNetIpHeader, KnxNetIpDecodeError> {
  if (bytes.length < HEADER_LENGTH)
    return err(
      decodeError("knxnetip.truncated", `${bytes.length} octets; the header alone needs 6`),
    );
  if (bytes[0] !== HEADER_LENGTH)
    return err(
      decodeError("knxnetip.header", `header length ${hex(bytes[0] as number)} is not 0x06`),
    );
  if (bytes[1] !== PROTOCOL_VERSION)
    return err(
      decodeError("knxnetip.header", `protocol version ${hex(bytes[1] as number)} is not 0x10`),
    );
  const serviceType = ((bytes[2] as number) << 8) | (bytes[3] as number);
  const totalLength = ((bytes[4] as number) << 8) | (bytes[5] as number);
  if (totalLength !== bytes.length)
    return err(
      decodeError(
        totalLength > bytes.length ? "knxnetip.truncated" : "knxnetip.length",
        `total length field says ${totalLength} octets, got ${bytes.length}`,
      ),
    );
  return ok({ serviceType, totalLength });
}

/** Decodes one datagram into a frame; never throws, whatever the octets. */
export function decodeKnxNetIpFrame(bytes: Uint8Array): Result<KnxNetIpFrame, KnxNetIpDecodeError> {
  const header = decodeHeader(bytes);
  if (!header.ok) return header;
  const service = SERVICE_BY_CODE.get(header.value.serviceType);
  if (service === undefined)
    return err(
      decodeError(
        "knxnetip.service",
        `service type ${hex(header.value.serviceType, 4)} is not implemented`,
      ),
    );
  const at = HEADER_LENGTH;
  const end = bytes.length;
  const size = end - at;
  const exactly = (n: number): KnxNetIpDecodeError | undefined =>
    size === n
      ? undefined
      : decodeError(
          size < n ? "knxnetip.truncated" : "knxnetip.length",
          `${service} body has ${size} octets, not ${n}`,
        );
  switch (service) {
    case "SEARCH_REQUEST":
    case "DESCRIPTION_REQUEST": {
      const wrong = exactly(HPAI_LENGTH);
      if (wrong) return err(wrong);
      const hpai = readHpai(bytes, at);
      if (!hpai.ok) return hpai;
      return ok(
        service === "SEARCH_REQUEST"
          ? { service, discoveryEndpoint: hpai.value }
          : { service, controlEndpoint: hpai.value },
      );
    }
    case "SEARCH_RESPONSE": {
      const hpai = readHpai(bytes, at);
      if (!hpai.ok) return hpai;
      const dibs = readDibs(bytes, at + HPAI_LENGTH, end);
      if (!dibs.ok) return dibs;
      return ok({ service, controlEndpoint: hpai.value, dibs: dibs.value });
    }
    case "DESCRIPTION_RESPONSE": {
      const dibs = readDibs(bytes, at, end);
      if (!dibs.ok) return dibs;
      return ok({ service, dibs: dibs.value });
    }
    case "CONNECT_REQUEST": {
      const control = readHpai(bytes, at);
      if (!control.ok) return control;
      const data = readHpai(bytes, at + HPAI_LENGTH);
      if (!data.ok) return data;
      const cri = readConnectionInfo(bytes, at + 2 * HPAI_LENGTH, end, "CRI");
      if (!cri.ok) return cri;
      return ok({
        service,
        controlEndpoint: control.value,
        dataEndpoint: data.value,
        cri: cri.value,
      });
    }
    case "CONNECT_RESPONSE": {
      if (size < 2) return err(exactly(2)!);
      const channelId = bytes[at] as number;
      const status = bytes[at + 1] as number;
      if (size === 2) return ok({ service, channelId, status });
      const data = readHpai(bytes, at + 2);
      if (!data.ok) return data;
      const crd = readConnectionInfo(bytes, at + 2 + HPAI_LENGTH, end, "CRD");
      if (!crd.ok) return crd;
      return ok({
        service,
        channelId,
        status,
        granted: { dataEndpoint: data.value, crd: crd.value },
      });
    }
    case "CONNECTIONSTATE_REQUEST":
    case "DISCONNECT_REQUEST": {
      const wrong = exactly(2 + HPAI_LENGTH);
      if (wrong) return err(wrong);
      const hpai = readHpai(bytes, at + 2);
      if (!hpai.ok) return hpai;
      return ok({ service, channelId: bytes[at] as number, controlEndpoint: hpai.value });
    }
    case "CONNECTIONSTATE_RESPONSE":
    case "DISCONNECT_RESPONSE": {
      const wrong = exactly(2);
      if (wrong) return err(wrong);
      return ok({ service, channelId: bytes[at] as number, status: bytes[at + 1] as number });
    }
    case "TUNNELLING_REQUEST":
    case "TUNNELLING_ACK": {
      if (size < CONNECTION_HEADER_LENGTH)
        return err(
          decodeError("knxnetip.truncated", `${service} needs a 4-octet connection header`),
        );
      if (bytes[at] !== CONNECTION_HEADER_LENGTH)
        return err(
          decodeError(
            "knxnetip.length",
            `connection header length ${hex(bytes[at] as number)} is not 0x04`,
          ),
        );
      const channelId = bytes[at + 1] as number;
      const sequenceCounter = bytes[at + 2] as number;
      if (service === "TUNNELLING_ACK") {
        const wrong = exactly(CONNECTION_HEADER_LENGTH);
        if (wrong) return err(wrong);
        return ok({ service, channelId, sequenceCounter, status: bytes[at + 3] as number });
      }
      if (size === CONNECTION_HEADER_LENGTH)
        return err(decodeError("knxnetip.truncated", "TUNNELLING_REQUEST carries no cEMI message"));
      return ok({
        service,
        channelId,
        sequenceCounter,
        cemi: bytes.slice(at + CONNECTION_HEADER_LENGTH, end),
      });
    }
  }
}
