import { cx } from "./cx";

/** A bordered paper surface for forms, tables and summaries. */
export function Panel({
  title,
  children,
  className,
}: {
  title?: string;
  children: React.ReactNode;
  className?: string;
}) {
  return (
    <section
      className={cx("rounded-lg border border-paper-line bg-paper-deep/40 p-5", className)}
      aria-label={title}
    >
      {title ? <h2 className="mb-3 text-sm font-semibold text-ink">{title}</h2> : null}
      {children}
    </section>
  );
}
