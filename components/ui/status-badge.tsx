import { cx } from "./cx";

/**
 * Small state label. Tones follow the house colours: teal for true / healthy /
 * passed, red only for faults and failures, copper for the accent, neutral otherwise.
 */
export type StatusTone = "healthy" | "fault" | "accent" | "neutral";

const toneClasses: Record<StatusTone, string> = {
  healthy: "bg-teal/10 text-teal ring-teal/30",
  fault: "bg-fault-soft text-fault ring-fault/30",
  accent: "bg-copper/10 text-copper-deep ring-copper/30",
  neutral: "bg-paper-deep text-ink-soft ring-paper-line",
};

export function StatusBadge({ tone, children }: { tone: StatusTone; children: React.ReactNode }) {
  return (
    <span
      className={cx(
        "inline-flex items-center rounded-full px-2 py-0.5 text-xs font-medium ring-1 ring-inset",
        toneClasses[tone],
      )}
    >
      {children}
    </span>
  );
}
