/**
 * Why octets were refused as a KNXnet/IP frame. Decoders return this instead of
 * throwing: every datagram is hostile until it decodes.
 *
 * - truncated: fewer octets than a field or a structure length needs
 * - header: header length or protocol version is not 0x06 / 0x10
 * - length: the total length (or a structure length) disagrees with the octets
 * - service: a service type this endpoint does not implement
 * - structure: a field holds a value the specification does not allow (HPAI protocol, DIB type, ...)
 */
export interface KnxNetIpDecodeError {
  readonly kind:
    | "knxnetip.truncated"
    | "knxnetip.header"
    | "knxnetip.length"
    | "knxnetip.service"
    | "knxnetip.structure";
  readonly message: string;
}

export function decodeError(
  kind: KnxNetIpDecodeError["kind"],
  message: string,
): KnxNetIpDecodeError {
  return { kind, message };
}

/** Two upper-case hex digits per octet, for messages. */
export function hex(value: number, digits = 2): string {
  return "0x" + value.toString(16).toUpperCase().padStart(digits, "0");
}
