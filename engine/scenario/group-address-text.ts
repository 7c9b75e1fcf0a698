/**
 * Whether a text is a group address a scenario may name ("1/0/1", "1/257", "4097").
 * Ranges follow knx-reference.md "Addresses": 3-level 0-31/0-7/0-255, 2-level
 * 0-31/0-2047, free 0-65535; 0/0/0 is broadcast, not a group.
 */
export function isGroupAddressText(text: string): boolean {
  const parts = text.split("/");
  if (!parts.every((part) => /^\d{1,5}$/.test(part))) return false;
  const numbers = parts.map(Number);
  let raw: number;
  if (numbers.length === 3) {
    const [main = 0, middle = 0, sub = 0] = numbers;
    if (main > 31 || middle > 7 || sub > 255) return false;
    raw = (main << 11) | (middle << 8) | sub;
  } else if (numbers.length === 2) {
    const [main = 0, sub = 0] = numbers;
    if (main > 31 || sub > 2047) return false;
    raw = (main << 11) | sub;
  } else if (numbers.length === 1) {
    raw = numbers[0] ?? 0;
    if (raw > 65535) return false;
  } else return false;
  return raw !== 0;
}
