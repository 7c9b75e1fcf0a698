import { cx } from "./cx";

/** Inline monospace text for group addresses, individual addresses, hex and raw values. */
export function Mono({ children, className }: { children: React.ReactNode; className?: string }) {
  return <span className={cx("font-mono text-[0.92em] tabular-nums", className)}>{children}</span>;
}
