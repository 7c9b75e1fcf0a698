import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { errorResponse } from "@/app/_lib/errors";
import { apiContentSecurityPolicy, type RouteParams } from "@/app/_lib/http";
import { liveSessions, type LiveSessionEvent } from "@/app/_lib/live/live-session-registry";

/** A comment line every so often keeps proxies from closing a quiet stream. */
const HEARTBEAT_MS = 15_000;
/**
 * Bytes a viewer may fall behind before its stream is closed: a viewer that
 * does not read must not make the server hold an ever longer queue. The
 * console reconnects and starts again from the full state.
 */
const MAX_BEHIND_BYTES = 8 * 1024 * 1024;

/**
 * GET /api/live-sessions/:id/events: server-sent events of one live session.
 * First the full current state (`message` events: the bench, then a batch
 * with every device, the active faults and the recent log), then every batch
 * as the session posts it; `session` events carry the session's view when its
 * endpoint or clients change, and `ended` { reason } closes the stream.
 */
export async function GET(request: Request, context: RouteParams<{ sessionId: string }>) {
  let sessionId: string;
  let session: Awaited<ReturnType<typeof verifyApiSession>>;
  try {
    sessionId = (await context.params).sessionId;
    session = await verifyApiSession(request);
    authorize(session, "console.use");
    liveSessions().view(session, sessionId);
  } catch (error) {
    return errorResponse(error);
  }

  const encoder = new TextEncoder();
  let cleanup = () => {};
  const stream = new ReadableStream<Uint8Array>(
    {
      start(controller) {
        let closed = false;
        let unwatch = () => {};
        const close = () => {
          if (closed) return;
          closed = true;
          unwatch();
          clearInterval(heartbeat);
          try {
            controller.close();
          } catch {
            // already closed by the client going away
          }
        };
        const send = (event: LiveSessionEvent) => {
          if (closed) return;
          if ((controller.desiredSize ?? 0) < -MAX_BEHIND_BYTES) return close();
          controller.enqueue(
            encoder.encode(`event: ${event.event}\ndata: ${JSON.stringify(event.data)}\n\n`),
          );
          if (event.event === "ended") close();
        };
        const heartbeat = setInterval(() => {
          if (!closed) controller.enqueue(encoder.encode(": heartbeat\n\n"));
        }, HEARTBEAT_MS);
        cleanup = close;
        request.signal.addEventListener("abort", close);
        try {
          unwatch = liveSessions().watch(session, sessionId, send);
        } catch {
          // ended between the check above and here
          send({ event: "ended", data: { reason: "stopped" } });
        }
      },
      cancel() {
        cleanup();
      },
    },
    { highWaterMark: 0, size: (chunk: Uint8Array) => chunk.byteLength },
  );

  return new Response(stream, {
    headers: {
      "Content-Type": "text/event-stream; charset=utf-8",
      "Cache-Control": "no-store, no-transform",
      Connection: "keep-alive",
      "X-Accel-Buffering": "no",
      "Content-Security-Policy": apiContentSecurityPolicy,
    },
  });
}
