"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import { Button } from "@/components/ui/button";
import { RunProgressBar } from "./run-progress-bar";
import { useRunProgress } from "./use-run-progress";
import { VerdictBadge } from "./verdict-badge";

interface Started {
  readonly id: string;
  readonly eventsUrl: string;
}

/**
 * "Run now": starts a replay on the server (POST /api/runs), follows its
 * progress over server-sent events, and links to the result when done.
 */
export function RunButton({
  target,
  label = "Run now",
  seed,
  benchRevisionId,
  beforeRun,
}: {
  target: { scenarioId: string } | { suiteId: string };
  label?: string;
  seed?: number;
  benchRevisionId?: string;
  /** Called first (e.g. to save an edited scenario); return false to stop. */
  beforeRun?: () => Promise<boolean>;
}) {
  const router = useRouter();
  const [started, setStarted] = useState<Started | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);
  const progress = useRunProgress(started?.eventsUrl ?? null);
  const finished = progress.status === "finished" || progress.status === "errored";

  useEffect(() => {
    // Server-rendered lists (last result, history) pick the new run up.
    if (finished) router.refresh();
  }, [finished, router]);

  async function start() {
    setError(null);
    setPending(true);
    try {
      if (beforeRun && !(await beforeRun())) return;
      const response = await fetch("/api/runs", {
        method: "POST",
        headers: { "Content-Type": "application/json" },
        body: JSON.stringify({ ...target, seed, benchRevisionId }),
      });
      const body = (await response.json()) as {
        runId?: string;
        suiteRunId?: string;
        eventsUrl?: string;
        error?: { message: string };
      };
      if (!response.ok || !body.eventsUrl) {
        setError(body.error?.message ?? `the server answered ${response.status}`);
        return;
      }
      setStarted({ id: (body.runId ?? body.suiteRunId)!, eventsUrl: body.eventsUrl });
    } catch {
      setError("could not reach the server");
    } finally {
      setPending(false);
    }
  }

  const running = started !== null && !finished && progress.status !== "lost";
  return (
    <div className="flex flex-wrap items-center gap-3">
      <Button onClick={start} disabled={pending || running}>
        {running ? "Running…" : label}
      </Button>
      {started ? <RunProgressBar progress={progress} label={`${label} progress`} /> : null}
      {started && finished ? (
        <span className="flex items-center gap-2 text-sm">
          <VerdictBadge verdict={progress.verdict} />
          <Link className="text-copper-deep underline" href={`/runs/${started.id}`}>
            View result
          </Link>
        </span>
      ) : null}
      {error ? (
        <p role="alert" className="text-sm text-fault">
          {error}
        </p>
      ) : null}
    </div>
  );
}
