"use client";

import type { ButtonVariant } from "@/components/ui/button";
import { StartAndOpenButton } from "@/components/ui/start-and-open-button";
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
  return (
    <StartAndOpenButton
      variant={variant}
      label={`Start ${bench.name} on the server`}
      title="Runs in real time on the server, keeps running while nobody watches, and can be published on KNXnet/IP"
      start={async () => serverSessionHref((await startLiveSession(bench.id)).id)}
      errorText={apiErrorText}
    >
      Start on server
    </StartAndOpenButton>
  );
}
