import { err, ok, type Result } from "../core/result";
import { HOST_PROTOCOL } from "./constants";
import { decodeError, hex, type KnxNetIpDecodeError } from "./decode-error";

/**
 * Host protocol address information (KNXnet/IP spec, Core §8.6.2):
 *
 *   structure length 0x08 | host protocol (0x01 UDP, 0x02 TCP) | IPv4 address (4) | port (2, big-endian)
 *
 * 0.0.0.0 port 0 is the "route back" form a client behind NAT sends: answer to
 * the address and port the datagram came from (Core §8.6.3, from memory).
 */
export interface Hpai {
  readonly protocol: "udp" | "tcp";
  /** Dotted IPv4 address, "127.0.0.1". */
  readonly address: string;
  readonly port: number;
}

export const HPAI_LENGTH = 8;

/** The NAT "route back" HPAI: 0.0.0.0:0 over UDP. */
export const ROUTE_BACK_HPAI: Hpai = { protocol: "udp", address: "0.0.0.0", port: 0 };

/** True for an HPAI that asks to be answered where the datagram came from (0.0.0.0 or port 0). */
export function isRouteBack(hpai: Hpai): boolean {
  return hpai.address === "0.0.0.0" || hpai.port === 0;
}

/** Writes an HPAI at `at`. Throws on an address that is not dotted IPv4 or a port outside 0..65535 (a bug). */
export function writeHpai(bytes: Uint8Array, at: number, hpai: Hpai): void {
  const octets = parseIpv4(hpai.address);
  if (octets === undefined) throw new RangeError(`hpai.address "${hpai.address}" is not IPv4`);
  if (!Number.isInteger(hpai.port) || hpai.port < 0 || hpai.port > 0xffff)
    throw new RangeError(`hpai.port ${hpai.port} is not in 0..65535`);
  bytes[at] = HPAI_LENGTH;
  bytes[at + 1] = hpai.protocol === "udp" ? HOST_PROTOCOL.IPV4_UDP : HOST_PROTOCOL.IPV4_TCP;
  bytes.set(octets, at + 2);
  bytes[at + 6] = hpai.port >>> 8;
  bytes[at + 7] = hpai.port & 0xff;
}

/** Reads an HPAI at `at`; refuses a wrong structure length or an unknown host protocol. */
export function readHpai(bytes: Uint8Array, at: number): Result<Hpai, KnxNetIpDecodeError> {
  if (bytes.length < at + HPAI_LENGTH)
    return err(decodeError("knxnetip.truncated", `HPAI at octet ${at} needs 8 octets`));
  const length = bytes[at] as number;
  if (length !== HPAI_LENGTH)
    return err(decodeError("knxnetip.length", `HPAI structure length is ${length}, not 8`));
  const code = bytes[at + 1] as number;
  if (code !== HOST_PROTOCOL.IPV4_UDP && code !== HOST_PROTOCOL.IPV4_TCP)
    return err(
      decodeError("knxnetip.structure", `HPAI host protocol ${hex(code)} is not UDP or TCP`),
    );
  return ok({
    protocol: code === HOST_PROTOCOL.IPV4_UDP ? "udp" : "tcp",
    address: `${bytes[at + 2]}.${bytes[at + 3]}.${bytes[at + 4]}.${bytes[at + 5]}`,
    port: ((bytes[at + 6] as number) << 8) | (bytes[at + 7] as number),
  });
}

/** The four octets of a dotted IPv4 address, or undefined when it is not one. */
export function parseIpv4(address: string): Uint8Array | undefined {
  const parts = address.split(".");
  if (parts.length !== 4) return undefined;
  const octets = new Uint8Array(4);
  for (let i = 0; i < 4; i++) {
    const part = parts[i] as string;
    if (!/^(0|[1-9][0-9]{0,2})$/.test(part)) return undefined;
    const value = Number(part);
    if (value > 255) return undefined;
    octets[i] = value;
  }
  return octets;
}
