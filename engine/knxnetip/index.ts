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
