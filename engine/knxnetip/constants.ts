/**
 * KNXnet/IP numbers (knx-reference.md, "cEMI and KNXnet/IP"; source key
 * **KNXnet/IP spec**: KNX Standard 03_08_02 Core and 03_08_04 Tunnelling, also
 * ISO 22510). Values marked "from memory" are not in knx-reference.md; the
 * tests cross-check them against the `knx` package's KnxConstants.js.
 */

/** Every KNXnet/IP frame starts with a 6-octet header (Core §2.3.1). */
export const HEADER_LENGTH = 0x06;

/** KNXnet/IP protocol version 1.0 (Core §2.3.1). */
export const PROTOCOL_VERSION = 0x10;

/** The standard KNXnet/IP UDP port. */
export const KNXNETIP_PORT = 3671;

/** The KNXnet/IP system setup multicast address, reported in the device information DIB. */
export const ROUTING_MULTICAST_ADDRESS = "224.0.23.12";

/** Service type identifiers of the core and tunnelling services. */
export const SERVICE_TYPES = {
  SEARCH_REQUEST: 0x0201,
  SEARCH_RESPONSE: 0x0202,
  DESCRIPTION_REQUEST: 0x0203,
  DESCRIPTION_RESPONSE: 0x0204,
  CONNECT_REQUEST: 0x0205,
  CONNECT_RESPONSE: 0x0206,
  CONNECTIONSTATE_REQUEST: 0x0207,
  CONNECTIONSTATE_RESPONSE: 0x0208,
  DISCONNECT_REQUEST: 0x0209,
  DISCONNECT_RESPONSE: 0x020a,
  TUNNELLING_REQUEST: 0x0420,
  TUNNELLING_ACK: 0x0421,
} as const;

export type ServiceName = keyof typeof SERVICE_TYPES;

/** Status codes of the specification (Core §7.8.5 and Tunnelling §2.7; 0x01, 0x02 from memory). */
export const STATUS = {
  E_NO_ERROR: 0x00,
  E_HOST_PROTOCOL_TYPE: 0x01,
  E_VERSION_NOT_SUPPORTED: 0x02,
  E_SEQUENCE_NUMBER: 0x04,
  E_CONNECTION_ID: 0x21,
  E_CONNECTION_TYPE: 0x22,
  E_CONNECTION_OPTION: 0x23,
  E_NO_MORE_CONNECTIONS: 0x24,
  E_DATA_CONNECTION: 0x26,
  E_KNX_CONNECTION: 0x27,
  E_TUNNELLING_LAYER: 0x29,
} as const;

/** HPAI host protocol codes (Core §8.6.2). */
export const HOST_PROTOCOL = { IPV4_UDP: 0x01, IPV4_TCP: 0x02 } as const;

/** Connection types of a CRI (Core §7.8.2; 0x03 device management from memory). */
export const CONNECTION_TYPE = { DEVICE_MGMT_CONNECTION: 0x03, TUNNEL_CONNECTION: 0x04 } as const;

/** Tunnelling layers of a tunnel CRI (Tunnelling §4.4.3; 0x04 raw and 0x80 busmonitor from memory). */
export const TUNNEL_LAYER = { LINK_LAYER: 0x02, RAW_LAYER: 0x04, BUSMONITOR_LAYER: 0x80 } as const;

/** Description type codes of DIBs (Core §7.5.4.1, from memory). */
export const DIB_TYPE = { DEVICE_INFO: 0x01, SUPP_SVC_FAMILIES: 0x02 } as const;

/** Service family ids in the supported service families DIB (Core §7.5.4.3, from memory). */
export const SERVICE_FAMILY = {
  CORE: 0x02,
  DEVICE_MANAGEMENT: 0x03,
  TUNNELLING: 0x04,
  ROUTING: 0x05,
} as const;

/** KNX medium codes in the device information DIB (Core §7.5.4.2, from memory): TP1 is 0x02. */
export const KNX_MEDIUM_TP1 = 0x02;

/**
 * Connection-state heartbeat: a client asks every 60 s; the server drops a silent
 * connection after 120 s (Core §5.4; from memory, as knx-reference.md says; the knx
 * package's client asks after 60 s idle, src/FSM.js).
 */
export const CONNECTION_ALIVE_TIMEOUT_US = 120_000_000;

/**
 * A tunnelling request not acknowledged within 1 s is sent once more, then the
 * connection ends (Tunnelling §2.6; from memory, as knx-reference.md says).
 */
export const TUNNELLING_REQUEST_TIMEOUT_US = 1_000_000;
