"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { errorText } from "../_shell/api-client";
import { startPracticeCopy } from "../_shell/practice-copy";

/** One click from a shared bench to the live console of the member's own practice copy. */
export function PracticeCopyButton({ bench }: { bench: { id: string; name: string } }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <div className="flex flex-col items-end gap-1">
      <Button
        disabled={busy}
        aria-busy={busy}
        aria-label={`Practice copy of ${bench.name}: open it live`}
        onClick={async () => {
          setBusy(true);
          setError(null);
          try {
            router.push(`/benches/${await startPracticeCopy(bench)}/live`);
          } catch (cause) {
            setError(errorText(cause));
            setBusy(false);
          }
        }}
      >
        Practice copy
      </Button>
      {error ? (
        <p role="alert" className="text-sm text-fault">
          {error}
        </p>
      ) : null}
    </div>
  );
}
