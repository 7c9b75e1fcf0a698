import { err, ok, type Result } from "../core/result";
import { CONNECTION_TYPE, TUNNEL_LAYER } from "./constants";
import { decodeError, type KnxNetIpDecodeError } from "./decode-error";

/**
 * Connection request information (CRI) and connection response data block (CRD)
 * (KNXnet/IP spec, Core §7.5.2 and §7.5.3; Tunnelling §4.4.3 and §4.4.4):
 *
 *   CRI: structure length | connection type | type-specific octets…
 *   CRD: structure length | connection type | type-specific octets…
 *
 * A tunnel on the link layer asks with CRI `04 04 02 00` (length 4,
 * TUNNEL_CONNECTION, TUNNEL_LINKLAYER, reserved) and is answered with CRD
 * `04 04 hh ll`, the individual address assigned to the tunnel. Other
 * connection types carry other octets, so both stay generic here and the
 * tunnelling server decides what it accepts.
 */
export interface ConnectionInfo {
  readonly connectionType: number;
  /** The octets after the connection type. */
  readonly data: Uint8Array;
}

/** A CRI: what a client asks for. */
export type Cri = ConnectionInfo;
/** A CRD: what the server granted. */
export type Crd = ConnectionInfo;

/** The CRI of a tunnel on the link layer: 04 04 02 00. */
export function tunnelCri(layer: number = TUNNEL_LAYER.LINK_LAYER): Cri {
  return { connectionType: CONNECTION_TYPE.TUNNEL_CONNECTION, data: Uint8Array.of(layer, 0) };
}

/** The CRD of a tunnel: 04 04 and the tunnel's individual address. */
export function tunnelCrd(individualAddress: number): Crd {
  return {
    connectionType: CONNECTION_TYPE.TUNNEL_CONNECTION,
    data: Uint8Array.of(individualAddress >>> 8, individualAddress & 0xff),
  };
}

/** The individual address a tunnel CRD assigns, or undefined for another CRD. */
export function crdIndividualAddress(crd: Crd): number | undefined {
  if (crd.connectionType !== CONNECTION_TYPE.TUNNEL_CONNECTION || crd.data.length !== 2)
    return undefined;
  return ((crd.data[0] as number) << 8) | (crd.data[1] as number);
}

export function connectionInfoLength(info: ConnectionInfo): number {
  return 2 + info.data.length;
}

/** Writes a CRI or CRD at `at`. Throws when it would not fit the one-octet length (a bug). */
export function writeConnectionInfo(bytes: Uint8Array, at: number, info: ConnectionInfo): void {
  const length = connectionInfoLength(info);
  if (length > 255) throw new RangeError(`connection info of ${length} octets is too long`);
  bytes[at] = length;
  bytes[at + 1] = info.connectionType;
  bytes.set(info.data, at + 2);
}

/** Reads a CRI or CRD at `at` that must end exactly at `end`. */
export function readConnectionInfo(
  bytes: Uint8Array,
  at: number,
  end: number,
  what: "CRI" | "CRD",
): Result<ConnectionInfo, KnxNetIpDecodeError> {
  if (end - at < 2)
    return err(decodeError("knxnetip.truncated", `${what} needs at least 2 octets`));
  const length = bytes[at] as number;
  if (length < 2 || at + length !== end)
    return err(
      decodeError(
        "knxnetip.length",
        `${what} structure length ${length} does not match the ${end - at} octets left`,
      ),
    );
  return ok({ connectionType: bytes[at + 1] as number, data: bytes.slice(at + 2, end) });
}
