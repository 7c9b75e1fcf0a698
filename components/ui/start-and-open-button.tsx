"use client";

import { useRouter } from "next/navigation";
import { useState, type ReactNode } from "react";
import { Button, type ButtonVariant } from "./button";

/**
 * A button that asks the server to start something (a live session, a
 * practice copy) and then opens the page it answers with. While it waits it
 * is busy; a refusal is shown under it in the server's words, and it can be
 * pressed again.
 */
export function StartAndOpenButton({
  start,
  errorText,
  variant,
  label,
  title,
  children,
}: {
  /** Starts it on the server; resolves to the page to open. */
  start: () => Promise<string>;
  /** The words a refusal shows. */
  errorText: (cause: unknown) => string;
  variant?: ButtonVariant;
  /** The button's accessible name. */
  label: string;
  title?: string;
  children: ReactNode;
}) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="flex flex-col items-end gap-1">
      <Button
        variant={variant}
        disabled={busy}
        aria-busy={busy}
        aria-label={label}
        title={title}
        onClick={async () => {
          setBusy(true);
          setError(null);
          try {
            router.push(await start());
          } catch (cause) {
            setError(errorText(cause));
            setBusy(false);
          }
        }}
      >
        {children}
      </Button>
      {error ? (
        <p role="alert" className="max-w-xs text-right text-sm text-fault">
          {error}
        </p>
      ) : null}
    </div>
  );
}
