import {
  CONNECTION_ALIVE_TIMEOUT_US,
  KNX_MEDIUM_TP1,
  ROUTING_MULTICAST_ADDRESS,
  SERVICE_FAMILY,
  TUNNELLING_REQUEST_TIMEOUT_US,
} from "./constants";
import type { DeviceInfoDib, Dib } from "./dib";

/** An IPv4 UDP address: dotted address and port. */
export interface UdpAddress {
  readonly address: string;
  readonly port: number;
}

/** What a tunnelling server is and how strict it is; `tunnellingServerConfig` fills the defaults. */
export interface TunnellingServerConfig {
  /** Where the server answers; reported as its control and data endpoint. */
  readonly endpoint: UdpAddress;
  /** Individual addresses on the bench's line handed to tunnels, one each; the count bounds the tunnels. */
  readonly tunnelAddresses: readonly number[];
  /** The server's own individual address, reported in the device information DIB. */
  readonly individualAddress: number;
  /** Up to 30 ISO 8859-1 characters. */
  readonly friendlyName: string;
  /** 6 octets. */
  readonly serialNumber: Uint8Array;
  /** 6 octets. */
  readonly macAddress: Uint8Array;
  /** A connection without a connection-state request for this long is closed, µs (120 s by the spec). */
  readonly connectionAliveTimeoutUs: number;
  /** A tunnelling request to a client unacknowledged this long is repeated once, then the connection closes, µs (1 s). */
  readonly tunnellingRequestTimeoutUs: number;
  /** Datagrams accepted per client IPv4 address: a bucket of `burst` refilled at `perSecond`. */
  readonly rateLimit: { readonly perSecond: number; readonly burst: number };
  /** cEMI messages waiting per tunnel for the client's acknowledgement; more are dropped and counted. */
  readonly maxQueuedPerTunnel: number;
  /** A tunnel's frames waiting for the line; a further L_Data.req is confirmed negatively at once. */
  readonly maxPendingPerTunnel: number;
  /** Client addresses remembered by the rate limit; the oldest is forgotten beyond this. */
  readonly maxRateLimitEntries: number;
  /**
   * Whether the address in a client's HPAI may be answered, given where the
   * datagram came from. Others are treated like the route-back form (answered at
   * the datagram's source). By default only the source's own IP address passes,
   * so the server never sends to an address that did not write to it.
   */
  readonly canReach: (address: string, source: UdpAddress) => boolean;
}

export const DEFAULT_TUNNELLING_SERVER_CONFIG: Omit<
  TunnellingServerConfig,
  "endpoint" | "tunnelAddresses" | "individualAddress"
> = {
  friendlyName: "Benchline bench",
  serialNumber: Uint8Array.of(0x00, 0x00, 0x00, 0x00, 0x00, 0x01),
  macAddress: new Uint8Array(6),
  connectionAliveTimeoutUs: CONNECTION_ALIVE_TIMEOUT_US,
  tunnellingRequestTimeoutUs: TUNNELLING_REQUEST_TIMEOUT_US,
  // Our own figures: a saturated TP1 line (about 50 telegrams/s) costs a client about
  // 150 datagrams/s (request, acknowledgements of L_Data.con and L_Data.ind).
  rateLimit: { perSecond: 500, burst: 200 },
  maxQueuedPerTunnel: 256,
  maxPendingPerTunnel: 16,
  maxRateLimitEntries: 1024,
  canReach: (address, source) => address === source.address,
};

/** A full configuration from the required fields and any overrides. */
export function tunnellingServerConfig(
  config: Pick<TunnellingServerConfig, "endpoint" | "tunnelAddresses" | "individualAddress"> &
    Partial<TunnellingServerConfig>,
): TunnellingServerConfig {
  const full = { ...DEFAULT_TUNNELLING_SERVER_CONFIG, ...config };
  if (full.tunnelAddresses.length === 0 || full.tunnelAddresses.length > 255)
    throw new RangeError("tunnelAddresses must hold 1..255 individual addresses");
  if (new Set(full.tunnelAddresses).size !== full.tunnelAddresses.length)
    throw new RangeError("tunnelAddresses must be distinct");
  for (const key of [
    "connectionAliveTimeoutUs",
    "tunnellingRequestTimeoutUs",
    "maxQueuedPerTunnel",
    "maxPendingPerTunnel",
    "maxRateLimitEntries",
  ] as const) {
    if (!Number.isSafeInteger(full[key]) || full[key] <= 0)
      throw new RangeError(`${key} ${full[key]} is not a positive integer`);
  }
  if (!(full.rateLimit.perSecond > 0) || !(full.rateLimit.burst >= 1))
    throw new RangeError("rateLimit needs perSecond > 0 and burst >= 1");
  return full;
}

/** The device information DIB this server reports. */
export function deviceInfoDib(config: TunnellingServerConfig): DeviceInfoDib {
  return {
    kind: "device-info",
    medium: KNX_MEDIUM_TP1,
    deviceStatus: 0,
    individualAddress: config.individualAddress,
    projectInstallationId: 0,
    serialNumber: config.serialNumber,
    multicastAddress: ROUTING_MULTICAST_ADDRESS,
    macAddress: config.macAddress,
    friendlyName: config.friendlyName,
  };
}

/** The DIBs of search and description responses: device information, then core v1 and tunnelling v1. */
export function descriptionDibs(config: TunnellingServerConfig): readonly Dib[] {
  return [
    deviceInfoDib(config),
    {
      kind: "service-families",
      families: [
        { id: SERVICE_FAMILY.CORE, version: 1 },
        { id: SERVICE_FAMILY.TUNNELLING, version: 1 },
      ],
    },
  ];
}
