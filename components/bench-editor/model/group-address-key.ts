import { formatGroupAddress, parseGroupAddress } from "@/engine";

/**
 * Links may spell an address differently from the list ("1/257" vs "1/1/1"),
 * so the editor compares raw values. Unparseable text compares as itself.
 */
export function groupAddressKey(text: string): string {
  const raw = parseGroupAddress(text);
  return raw.ok ? String(raw.value) : `?${text}`;
}

export function sameGroupAddress(a: string, b: string): boolean {
  return groupAddressKey(a) === groupAddressKey(b);
}

/** Three-level text of a valid address, or the text unchanged. */
export function normalGroupAddress(text: string): string {
  const raw = parseGroupAddress(text);
  return raw.ok ? formatGroupAddress(raw.value) : text;
}
