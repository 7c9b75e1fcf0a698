import { cx } from "./cx";

export type ButtonVariant = "primary" | "secondary" | "danger";

const variantClasses: Record<ButtonVariant, string> = {
  primary: "bg-copper text-white hover:bg-copper-deep",
  secondary: "border border-paper-line bg-paper text-ink hover:bg-paper-deep",
  // Red is for faults; a destructive action is the one other place it appears.
  danger: "bg-fault text-white hover:bg-fault/90",
};

/** A native button in one of the house variants; defaults to type="button". */
export function Button({
  variant = "primary",
  className,
  type = "button",
  ...props
}: React.ButtonHTMLAttributes<HTMLButtonElement> & { variant?: ButtonVariant }) {
  return (
    <button
      type={type}
      className={cx(
        "inline-flex items-center justify-center gap-2 rounded-md px-3.5 py-2 text-sm font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-50",
        variantClasses[variant],
        className,
      )}
      {...props}
    />
  );
}
