export {
  Tp1Line,
  Tp1Sender,
  NO_ACK_OCTET,
  copiedTelegram,
  winsArbitration,
  type BusStats,
  type Telegram,
  type Tp1LineHost,
  type Tp1LineOptions,
} from "./tp1-line";
