"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button, type ButtonVariant } from "@/components/ui/button";
import { apiErrorText, startLiveSession } from "./live-session-api";
import { serverSessionHref } from "./session-href";

/**
 * Starts a live session of the bench on the server and opens it in the
 * console. A refusal (a session limit reached, a bench that does not run)
 * is shown under the button with the server's words.
 */
export function StartSessionButton({
  bench,
  variant = "secondary",
}: {
  bench: { id: string; name: string };
  variant?: ButtonVariant;
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
        aria-label={`Start ${bench.name} on the server`}
        title="Runs in real time on the server, keeps running while nobody watches, and can be published on KNXnet/IP"
        onClick={async () => {
          setBusy(true);
          setError(null);
          try {
            const session = await startLiveSession(bench.id);
            router.push(serverSessionHref(session.id));
          } catch (cause) {
            setError(apiErrorText(cause));
            setBusy(false);
          }
        }}
      >
        Start on server
      </Button>
      {error ? (
        <p role="alert" className="max-w-xs text-right text-sm text-fault">
          {error}
        </p>
      ) : null}
    </div>
  );
}
