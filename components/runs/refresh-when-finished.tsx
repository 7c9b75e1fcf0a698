"use client";

import { useRouter } from "next/navigation";
import { useEffect } from "react";
import { useRunProgress } from "./use-run-progress";

/**
 * Follows a run that was still going when the page was rendered and reloads
 * the page's server data once it finishes, so a result shows up however the
 * page got here (a reload, a remounted form, another tab).
 */
export function RefreshWhenFinished({ runId }: { runId: string }) {
  const router = useRouter();
  const progress = useRunProgress(`/api/runs/${runId}/events`);
  const finished = progress.status === "finished" || progress.status === "errored";
  useEffect(() => {
    if (finished) router.refresh();
  }, [finished, router]);
  return null;
}
