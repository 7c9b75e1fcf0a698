"use client";

import { StartAndOpenButton } from "@/components/ui/start-and-open-button";
import { errorText } from "../_shell/api-client";
import { startPracticeCopy } from "../_shell/practice-copy";

/** One click from a shared bench to the live console of the member's own practice copy. */
export function PracticeCopyButton({ bench }: { bench: { id: string; name: string } }) {
  return (
    <StartAndOpenButton
      label={`Practice copy of ${bench.name}: open it live`}
      start={async () => `/benches/${await startPracticeCopy(bench)}/live`}
      errorText={errorText}
    >
      Practice copy
    </StartAndOpenButton>
  );
}
