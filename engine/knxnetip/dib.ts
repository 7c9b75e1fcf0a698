import { err, ok, type Result } from "../core/result";
import { DIB_TYPE } from "./constants";
import { decodeError, hex, type KnxNetIpDecodeError } from "./decode-error";
import { parseIpv4 } from "./hpai";

/**
 * Description information blocks (KNXnet/IP spec, Core §7.5.4; layouts from memory):
 *
 * Device information DIB, 54 octets:
 *   0x36 | 0x01 | KNX medium | device status | individual address (2)
 *   | project-installation id (2) | serial number (6) | routing multicast address (4)
 *   | MAC address (6) | friendly name (30, ISO 8859-1, padded with 0x00)
 *
 * Supported service families DIB:
 *   length | 0x02 | (family id, version) pairs
 *
 * Any other DIB is kept as its type and octets so a response round-trips.
 */
export interface DeviceInfoDib {
  readonly kind: "device-info";
  /** KNX medium code: 0x02 for TP1. */
  readonly medium: number;
  /** Bit 0: programming mode. */
  readonly deviceStatus: number;
  readonly individualAddress: number;
  readonly projectInstallationId: number;
  /** 6 octets. */
  readonly serialNumber: Uint8Array;
  /** Dotted IPv4. */
  readonly multicastAddress: string;
  /** 6 octets. */
  readonly macAddress: Uint8Array;
  /** Up to 30 characters of ISO 8859-1. */
  readonly friendlyName: string;
}

export interface ServiceFamiliesDib {
  readonly kind: "service-families";
  readonly families: readonly { readonly id: number; readonly version: number }[];
}

export interface OtherDib {
  readonly kind: "other";
  readonly type: number;
  readonly data: Uint8Array;
}

export type Dib = DeviceInfoDib | ServiceFamiliesDib | OtherDib;

export const DEVICE_INFO_DIB_LENGTH = 54;
const FRIENDLY_NAME_OCTETS = 30;

export function dibLength(dib: Dib): number {
  switch (dib.kind) {
    case "device-info":
      return DEVICE_INFO_DIB_LENGTH;
    case "service-families":
      return 2 + 2 * dib.families.length;
    case "other":
      return 2 + dib.data.length;
  }
}

/** Writes a DIB at `at`. Throws on a field that does not fit (a bug in the caller). */
export function writeDib(bytes: Uint8Array, at: number, dib: Dib): void {
  const length = dibLength(dib);
  if (length > 255) throw new RangeError(`DIB of ${length} octets is too long`);
  bytes[at] = length;
  switch (dib.kind) {
    case "device-info": {
      bytes[at + 1] = DIB_TYPE.DEVICE_INFO;
      bytes[at + 2] = dib.medium;
      bytes[at + 3] = dib.deviceStatus;
      bytes[at + 4] = dib.individualAddress >>> 8;
      bytes[at + 5] = dib.individualAddress & 0xff;
      bytes[at + 6] = dib.projectInstallationId >>> 8;
      bytes[at + 7] = dib.projectInstallationId & 0xff;
      if (dib.serialNumber.length !== 6) throw new RangeError("dib.serialNumber is not 6 octets");
      bytes.set(dib.serialNumber, at + 8);
      const multicast = parseIpv4(dib.multicastAddress);
      if (multicast === undefined)
        throw new RangeError(`dib.multicastAddress "${dib.multicastAddress}" is not IPv4`);
      bytes.set(multicast, at + 14);
      if (dib.macAddress.length !== 6) throw new RangeError("dib.macAddress is not 6 octets");
      bytes.set(dib.macAddress, at + 18);
      const name = dib.friendlyName;
      if (name.length > FRIENDLY_NAME_OCTETS)
        throw new RangeError(`dib.friendlyName is longer than ${FRIENDLY_NAME_OCTETS} characters`);
      for (let i = 0; i < FRIENDLY_NAME_OCTETS; i++) {
        const code = i < name.length ? name.charCodeAt(i) : 0;
        if (code > 0xff || (code === 0 && i < name.length))
          throw new RangeError("dib.friendlyName is not ISO 8859-1 without NUL");
        bytes[at + 24 + i] = code;
      }
      return;
    }
    case "service-families":
      bytes[at + 1] = DIB_TYPE.SUPP_SVC_FAMILIES;
      dib.families.forEach((family, i) => {
        bytes[at + 2 + 2 * i] = family.id;
        bytes[at + 3 + 2 * i] = family.version;
      });
      return;
    case "other":
      bytes[at + 1] = dib.type;
      bytes.set(dib.data, at + 2);
      return;
  }
}

/** Reads the DIBs from `at` to `end`; each must fit exactly. */
export function readDibs(
  bytes: Uint8Array,
  at: number,
  end: number,
): Result<readonly Dib[], KnxNetIpDecodeError> {
  const dibs: Dib[] = [];
  let offset = at;
  while (offset < end) {
    if (end - offset < 2)
      return err(decodeError("knxnetip.truncated", `DIB at octet ${offset} needs 2 octets`));
    const length = bytes[offset] as number;
    const type = bytes[offset + 1] as number;
    if (length < 2 || offset + length > end)
      return err(
        decodeError("knxnetip.length", `DIB at octet ${offset} has structure length ${length}`),
      );
    const dib = readDib(bytes, offset, length, type);
    if (!dib.ok) return dib;
    dibs.push(dib.value);
    offset += length;
  }
  return ok(dibs);
}

function readDib(
  bytes: Uint8Array,
  at: number,
  length: number,
  type: number,
): Result<Dib, KnxNetIpDecodeError> {
  if (type === DIB_TYPE.DEVICE_INFO) {
    if (length !== DEVICE_INFO_DIB_LENGTH)
      return err(
        decodeError("knxnetip.length", `device information DIB has length ${length}, not 54`),
      );
    let friendlyName = "";
    for (let i = 0; i < FRIENDLY_NAME_OCTETS; i++) {
      const code = bytes[at + 24 + i] as number;
      if (code === 0) break;
      friendlyName += String.fromCharCode(code);
    }
    return ok({
      kind: "device-info",
      medium: bytes[at + 2] as number,
      deviceStatus: bytes[at + 3] as number,
      individualAddress: ((bytes[at + 4] as number) << 8) | (bytes[at + 5] as number),
      projectInstallationId: ((bytes[at + 6] as number) << 8) | (bytes[at + 7] as number),
      serialNumber: bytes.slice(at + 8, at + 14),
      multicastAddress: `${bytes[at + 14]}.${bytes[at + 15]}.${bytes[at + 16]}.${bytes[at + 17]}`,
      macAddress: bytes.slice(at + 18, at + 24),
      friendlyName,
    });
  }
  if (type === DIB_TYPE.SUPP_SVC_FAMILIES) {
    if (length % 2 !== 0)
      return err(
        decodeError(
          "knxnetip.length",
          `service families DIB length ${length} is odd (${hex(type)})`,
        ),
      );
    const families: { id: number; version: number }[] = [];
    for (let i = at + 2; i < at + length; i += 2)
      families.push({ id: bytes[i] as number, version: bytes[i + 1] as number });
    return ok({ kind: "service-families", families });
  }
  return ok({ kind: "other", type, data: bytes.slice(at + 2, at + length) });
}
