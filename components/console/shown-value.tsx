import { cx } from "@/components/ui/cx";

/** How the engine formats an empty text (DPT 16): a quoted empty string. */
const EMPTY_TEXT = '""';

/**
 * A formatted value as a person reads it: an empty text is the word "(empty)"
 * in italics rather than a pair of quotes (italics, not a lighter colour, since
 * the value may sit on a highlighted background where grey fails contrast); a value not known yet is a dash;
 * no value at all ("", a read request) shows nothing.
 */
export function ShownValue({
  value,
  className,
}: {
  value: string | null | undefined;
  className?: string;
}) {
  if (value === null || value === undefined) return <span className={className}>–</span>;
  if (value === EMPTY_TEXT)
    return <span className={cx("font-sans italic", className)}>(empty)</span>;
  return <span className={className}>{value}</span>;
}

/** The same for plain text (titles, labels): "(empty)" for an empty text, "–" for none. */
export function shownValueText(value: string | null | undefined): string {
  if (value === null || value === undefined) return "–";
  return value === EMPTY_TEXT ? "(empty)" : value;
}
