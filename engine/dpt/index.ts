export { payloadOctets, type DptCodec, type DptError } from "./dpt-codec";
export { dptIds, dptSizeBits, getDpt } from "./registry";
export {
  DPT9_INVALID,
  DPT9_INVALID_RAW,
  DPT9_MAX,
  DPT9_MIN,
  decodeFloat16Raw,
  encodeFloat16Raw,
  isDptInvalid,
  type Dpt9Value,
  type DptInvalid,
} from "./dpt9";
export type { SwitchControl } from "./dpt2";
export type { DimmingControl } from "./dpt3";
export type { SceneControl } from "./dpt17-18";
export type { Rgb } from "./dpt232";
export { HVAC_CONTROLLER_MODES, HVAC_MODES } from "./dpt20";
