export {
  DEFAULT_HOP_COUNT,
  MAX_LONG_PAYLOAD_OCTETS,
  tp1FrameOctets,
  type DataFrame,
  type GroupService,
  type Priority,
} from "./data-frame";
export type { FrameDecodeError } from "./frame-decode-error";
export { toHex, fromHex } from "./hex";
export {
  decodeTp1Frame,
  encodeTp1Frame,
  tp1CheckOctet,
  MAX_TP1_FRAME_OCTETS,
  MIN_TP1_FRAME_OCTETS,
} from "./tp1-frame";
export * from "./timing";
export {
  CEMI_MESSAGE_CODES,
  decodeCemi,
  encodeCemi,
  type CemiLData,
  type CemiLDataInput,
  type CemiMessageCode,
} from "./cemi";
export {
  describeTelegram,
  type DescribeTelegramOptions,
  type TelegramDescription,
} from "./describe-telegram";
