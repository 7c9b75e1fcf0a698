import { err, ok, type Result } from "../core/result";
import { addressError, type AddressError } from "./address-error";
import { assertRawAddress } from "./group-address";

/** 15.15.255, the address a device has before it is programmed (knx-reference.md, Addresses). */
export const UNPROGRAMMED_INDIVIDUAL_ADDRESS = 0xffff;

const shape = /^(\d{1,3})\.(\d{1,3})\.(\d{1,3})$/;

/**
 * Parses an individual address area.line.device (0-15.0-15.0-255), e.g. "1.1.10",
 * into its raw 16-bit form area<<12 | line<<8 | device.
 */
export function parseIndividualAddress(text: string): Result<number, AddressError> {
  const m = shape.exec(text.trim());
  if (m === null) {
    return err(
      addressError(text, `individual address "${text}" must be area.line.device, e.g. 1.1.10`),
    );
  }
  const area = Number(m[1]);
  const line = Number(m[2]);
  const device = Number(m[3]);
  if (area > 15)
    return err(addressError(text, `individual address "${text}": area ${area} is above 15`));
  if (line > 15)
    return err(addressError(text, `individual address "${text}": line ${line} is above 15`));
  if (device > 255)
    return err(addressError(text, `individual address "${text}": device ${device} is above 255`));
  return ok((area << 12) | (line << 8) | device);
}

/** Formats a raw 16-bit individual address as area.line.device ("1.1.10"). */
export function formatIndividualAddress(raw: number): string {
  assertRawAddress(raw, "individual address");
  return `${raw >>> 12}.${(raw >>> 8) & 0x0f}.${raw & 0xff}`;
}
