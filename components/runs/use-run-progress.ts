"use client";

import { useEffect, useState } from "react";

/** What the page knows about a run in progress, fed by the run's event stream. */
export interface RunProgress {
  readonly status: "connecting" | "queued" | "running" | "finished" | "errored" | "lost";
  readonly done: number;
  readonly total: number;
  readonly verdict: "pass" | "fail" | "error" | null;
  /** The scenarios of a suite as they finish. */
  readonly finished: readonly { runId: string; scenarioName: string; verdict: string }[];
}

const initial: RunProgress = {
  status: "connecting",
  done: 0,
  total: 0,
  verdict: null,
  finished: [],
};

/**
 * Follow a run's server-sent events (GET /api/runs/:id/events) until it
 * finishes. `eventsUrl` null means nothing to follow yet.
 */
export function useRunProgress(eventsUrl: string | null): RunProgress {
  const [progress, setProgress] = useState<RunProgress>(initial);

  useEffect(() => {
    if (!eventsUrl) return;
    const source = new EventSource(eventsUrl);
    let ended = false;
    const read = (event: MessageEvent<string>) => JSON.parse(event.data) as Record<string, unknown>;
    const onState = (event: MessageEvent<string>) => {
      const data = read(event);
      setProgress((current) => ({
        ...current,
        status: data.status as RunProgress["status"],
        done: Number(data.done),
        total: Number(data.total),
      }));
    };
    source.addEventListener("run.snapshot", onState);
    source.addEventListener("run.started", onState);
    source.addEventListener("scenario.finished", (event) => {
      const data = read(event);
      setProgress((current) => ({
        ...current,
        status: "running",
        done: Number(data.done),
        total: Number(data.total),
        finished: [
          ...current.finished,
          {
            runId: String(data.runId),
            scenarioName: String(data.scenarioName),
            verdict: String(data.verdict),
          },
        ],
      }));
    });
    source.addEventListener("run.finished", (event) => {
      const data = read(event);
      ended = true;
      source.close();
      setProgress((current) => ({
        ...current,
        status: data.status as RunProgress["status"],
        done: Number(data.done),
        total: Number(data.total),
        verdict: (data.verdict as RunProgress["verdict"]) ?? null,
      }));
    });
    source.onerror = () => {
      // The stream ends after run.finished; any other close is a lost connection.
      if (ended) return;
      source.close();
      setProgress((current) => ({ ...current, status: "lost" }));
    };
    return () => {
      ended = true;
      source.close();
    };
  }, [eventsUrl]);

  return eventsUrl ? progress : initial;
}
