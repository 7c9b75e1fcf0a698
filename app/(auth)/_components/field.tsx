/** A labelled input with its error message tied to it for screen readers. */
export function Field({
  label,
  name,
  error,
  hint,
  ...input
}: React.InputHTMLAttributes<HTMLInputElement> & {
  label: string;
  name: string;
  error?: string | undefined;
  hint?: string;
}) {
  const errorId = `${name}-error`;
  return (
    <label className="flex flex-col gap-1 text-sm">
      <span className="font-medium">{label}</span>
      <input
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? errorId : undefined}
        className="rounded-md border border-paper-line bg-white/70 px-3 py-2 text-ink outline-none focus:border-copper"
        {...input}
      />
      {hint && !error ? <span className="text-xs text-ink-soft">{hint}</span> : null}
      {error ? (
        <span id={errorId} className="text-xs text-fault">
          {error}
        </span>
      ) : null}
    </label>
  );
}

/** A form-level message; faults in red, confirmations in teal. */
export function FormMessage({
  tone,
  children,
}: {
  tone: "fault" | "healthy";
  children: React.ReactNode;
}) {
  return (
    <p
      role={tone === "fault" ? "alert" : "status"}
      className={
        tone === "fault"
          ? "rounded-md bg-fault-soft px-3 py-2 text-sm text-fault"
          : "rounded-md bg-teal/10 px-3 py-2 text-sm text-teal"
      }
    >
      {children}
    </p>
  );
}
