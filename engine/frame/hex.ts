/** Octets as upper-case hex pairs separated by spaces ("BC 11 01"), the form traces and logs show. */
export function toHex(bytes: Uint8Array): string {
  let text = "";
  for (let i = 0; i < bytes.length; i++) {
    if (i > 0) text += " ";
    text += (bytes[i] as number).toString(16).toUpperCase().padStart(2, "0");
  }
  return text;
}

/** Parses "BC 11 01" / "bc1101" into octets; returns undefined for odd length or non-hex text. */
export function fromHex(text: string): Uint8Array | undefined {
  const digits = text.replace(/\s+/g, "");
  if (digits.length % 2 !== 0 || !/^[0-9a-fA-F]*$/.test(digits)) return undefined;
  const bytes = new Uint8Array(digits.length / 2);
  for (let i = 0; i < bytes.length; i++) bytes[i] = parseInt(digits.slice(2 * i, 2 * i + 2), 16);
  return bytes;
}
