import type { GroupObjectFlags } from "@/engine";

/** The flags in their usual order with the letter each is known by. */
export const FLAG_ORDER: readonly {
  readonly key: keyof GroupObjectFlags;
  readonly letter: string;
  readonly label: string;
}[] = [
  { key: "communication", letter: "C", label: "communication" },
  { key: "read", letter: "R", label: "read" },
  { key: "write", letter: "W", label: "write" },
  { key: "transmit", letter: "T", label: "transmit" },
  { key: "update", letter: "U", label: "update" },
  { key: "readOnInit", letter: "I", label: "read on init" },
];

/** "CWTU" style text of the flags that are set; "-" in place of a cleared flag. */
export function flagLetters(flags: GroupObjectFlags): string {
  return FLAG_ORDER.map((f) => (flags[f.key] ? f.letter : "-")).join("");
}
