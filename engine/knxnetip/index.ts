export * from "./constants";
export type { KnxNetIpDecodeError } from "./decode-error";
export { type Hpai, ROUTE_BACK_HPAI, isRouteBack, parseIpv4 } from "./hpai";
export {
  type ConnectionInfo,
  type Cri,
  type Crd,
  tunnelCri,
  tunnelCrd,
  crdIndividualAddress,
} from "./connection-info";
export type { Dib, DeviceInfoDib, ServiceFamiliesDib, OtherDib } from "./dib";
export {
  type KnxNetIpFrame,
  type FrameOf,
  type KnxNetIpHeader,
  encodeKnxNetIpFrame,
  decodeKnxNetIpFrame,
  decodeHeader,
} from "./knxnetip-frame";
export type { LineAccess } from "./line-access";
export {
  type UdpAddress,
  type TunnellingServerConfig,
  DEFAULT_TUNNELLING_SERVER_CONFIG,
  tunnellingServerConfig,
  deviceInfoDib,
  descriptionDibs,
} from "./server-config";
export {
  type TunnelConnection,
  type TunnellingServerCounters,
  type TunnellingServerState,
  type TunnellingServerEvent,
  type TunnellingServerEffect,
  type TunnellingServerResult,
  type CloseReason,
  type DropReason,
  initialTunnellingServerState,
  nextDeadlineUs,
  tunnellingServerTransition,
} from "./tunnelling-server";
export {
  type TunnelAddressPool,
  type TunnelAddressPoolError,
  tunnelAddressPool,
} from "./tunnel-address-pool";
