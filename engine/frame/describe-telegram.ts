import { formatGroupAddress, type GroupAddressStyle } from "../address/group-address";
import { formatIndividualAddress } from "../address/individual-address";
import { getDpt } from "../dpt/registry";
import type { DataFrame, GroupService, Priority } from "./data-frame";
import { toHex } from "./hex";
import { encodeTp1Frame } from "./tp1-frame";

/** A telegram in words, for the trace and the telegram log. Plain JSON. */
export interface TelegramDescription {
  /** Sender as area.line.device, "1.1.1". */
  readonly source: string;
  /** Group address ("1/0/1") or individual address ("1.1.10"). */
  readonly destination: string;
  readonly destinationName?: string;
  readonly service: GroupService;
  readonly priority: Priority;
  readonly repeated: boolean;
  readonly dpt?: string;
  /** Decoded value with its unit ("21.00 °C"); absent for a read or when no DPT was given. */
  readonly value?: string;
  /** Why the payload did not decode under `dpt`, e.g. a wrong length. */
  readonly valueError?: string;
  /** Data octets, "0C 1A" ("" for a read). */
  readonly payloadHex: string;
  /** The whole TP1 frame with its check octet, "BC 11 01 08 01 E1 00 81 3A". */
  readonly rawHex: string;
  /** One line: "1.1.1 -> 1/0/1 Hall light: GroupValue_Write On". */
  readonly text: string;
}

export interface DescribeTelegramOptions {
  /** DPT of the destination group address, to decode the value. */
  readonly dpt?: string;
  readonly groupAddressName?: string;
  readonly groupAddressStyle?: GroupAddressStyle;
}

/** Describes a data frame for people: addresses as text, DPT-decoded value, raw hex. */
export function describeTelegram(
  frame: DataFrame,
  options: DescribeTelegramOptions = {},
): TelegramDescription {
  const source = formatIndividualAddress(frame.source);
  const destination =
    frame.addressType === "group"
      ? formatGroupAddress(frame.destination, options.groupAddressStyle)
      : formatIndividualAddress(frame.destination);
  const payloadHex = toHex(frame.payload);
  let value: string | undefined;
  let valueError: string | undefined;
  if (frame.service !== "GroupValue_Read" && options.dpt !== undefined) {
    const codec = getDpt(options.dpt);
    if (codec === undefined) {
      valueError = `unknown DPT ${options.dpt}`;
    } else {
      const decoded = codec.decode(frame.payload);
      if (decoded.ok) value = codec.format(decoded.value);
      else valueError = decoded.error.message;
    }
  }
  const name = options.groupAddressName === undefined ? "" : ` ${options.groupAddressName}`;
  const shown = frame.service === "GroupValue_Read" ? "" : ` ${value ?? payloadHex}`;
  return {
    source,
    destination,
    ...(options.groupAddressName === undefined
      ? {}
      : { destinationName: options.groupAddressName }),
    service: frame.service,
    priority: frame.priority,
    repeated: frame.repeated,
    ...(options.dpt === undefined ? {} : { dpt: options.dpt }),
    ...(value === undefined ? {} : { value }),
    ...(valueError === undefined ? {} : { valueError }),
    payloadHex,
    rawHex: toHex(encodeTp1Frame(frame)),
    text: `${source} -> ${destination}${name}: ${frame.service}${shown}${frame.repeated ? " (repeated)" : ""}`,
  };
}
