import { verifyApiSession } from "@/app/_lib/dal";
import { errorResponse } from "@/app/_lib/errors";
import type { RouteParams } from "@/app/_lib/http";
import { loadRunOrSuiteRun } from "@/app/_lib/policy/run";
import { type RunProgressEvent, subscribeToRun } from "@/app/_lib/runs/run-events";
import { interruptedRunMessage } from "@/db/queries/runs";

/** A comment line every so often keeps proxies from closing a quiet stream. */
const HEARTBEAT_MS = 15_000;

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

  const encoder = new TextEncoder();
  let cleanup = () => {};
  const stream = new ReadableStream<Uint8Array>({
    start(controller) {
      let closed = false;
      const send = (event: RunProgressEvent) => {
        if (closed) return;
        controller.enqueue(
          encoder.encode(`event: ${event.kind}\ndata: ${JSON.stringify(event)}\n\n`),
        );
        if (event.kind === "run.finished") close();
      };
      // Listen before reading the snapshot, so no event falls between the two.
      const unsubscribe = subscribeToRun(channel, send);
      const heartbeat = setInterval(() => {
        if (!closed) controller.enqueue(encoder.encode(": heartbeat\n\n"));
      }, HEARTBEAT_MS);
      const close = () => {
        if (closed) return;
        closed = true;
        unsubscribe();
        clearInterval(heartbeat);
        try {
          controller.close();
        } catch {
          // already closed by the client going away
        }
      };
      cleanup = close;
      request.signal.addEventListener("abort", close);
      try {
        send(snapshotOf(loadRunOrSuiteRun(session, channel)));
      } catch {
        close();
      }
    },
    cancel() {
      cleanup();
    },
  });

  return new Response(stream, {
    headers: {
      "Content-Type": "text/event-stream; charset=utf-8",
      "Cache-Control": "no-store, no-transform",
      Connection: "keep-alive",
      "X-Accel-Buffering": "no",
    },
  });
}
