import { verifyApiSession } from "@/app/_lib/dal";
import { errorResponse } from "@/app/_lib/errors";
import { eventStreamResponse } from "@/app/_lib/event-stream";
import type { RouteParams } from "@/app/_lib/http";
import { loadRunOrSuiteRun } from "@/app/_lib/policy/run";
import { type RunProgressEvent, subscribeToRun } from "@/app/_lib/runs/run-events";
import { interruptedRunMessage } from "@/db/queries/runs";

function snapshotOf(visible: ReturnType<typeof loadRunOrSuiteRun>): RunProgressEvent {
  if (visible.kind === "scenario") {
    const { run } = visible;
    const finished = run.status === "finished" || run.status === "errored";
    return finished
      ? {
          kind: "run.finished",
          status: run.status === "errored" ? "errored" : "finished",
          verdict: run.verdict,
          done: 1,
          total: 1,
          durationMs: run.durationMs,
          ...(run.errorMessage ? { message: run.errorMessage } : {}),
        }
      : { kind: "run.snapshot", status: run.status, done: 0, total: 1 };
  }
  const { suiteRun } = visible;
  return suiteRun.status === "finished" || suiteRun.status === "errored"
    ? {
        kind: "run.finished",
        status: suiteRun.status === "errored" ? "errored" : "finished",
        verdict: suiteRun.verdict,
        done: suiteRun.scenariosDone,
        total: suiteRun.scenariosTotal,
        durationMs: suiteRun.durationMs,
        // A suite run ends errored only when a server stop interrupted it.
        ...(suiteRun.status === "errored" ? { message: interruptedRunMessage } : {}),
      }
    : {
        kind: "run.snapshot",
        status: suiteRun.status,
        done: suiteRun.scenariosDone,
        total: suiteRun.scenariosTotal,
      };
}

/**
 * GET /api/runs/:id/events — server-sent events with a run's (or suite run's)
 * progress: first a snapshot from the database, then `run.started`,
 * `scenario.finished` for each scenario of a suite, and `run.finished`, after
 * which the stream ends. Each message is `event: <kind>` with JSON data. A run
 * that a server stop interrupted was ended at start-up (instrumentation.ts), so
 * its snapshot is already `run.finished` (errored, with the reason) and the
 * stream closes at once instead of waiting forever.
 */
export async function GET(request: Request, context: RouteParams<{ runId: string }>) {
  let channel: string;
  let session: Awaited<ReturnType<typeof verifyApiSession>>;
  try {
    channel = (await context.params).runId;
    session = await verifyApiSession(request);
    loadRunOrSuiteRun(session, channel);
  } catch (error) {
    return errorResponse(error);
  }

  return eventStreamResponse(request, (sink) => {
    const send = (event: RunProgressEvent) => {
      sink.send(event.kind, event);
      if (event.kind === "run.finished") sink.close();
    };
    // Listen before reading the snapshot, so no event falls between the two.
    const unsubscribe = subscribeToRun(channel, send);
    try {
      send(snapshotOf(loadRunOrSuiteRun(session, channel)));
    } catch {
      sink.close();
    }
    return unsubscribe;
  });
}
