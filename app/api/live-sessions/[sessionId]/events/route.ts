import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { errorResponse } from "@/app/_lib/errors";
import { eventStreamResponse } from "@/app/_lib/event-stream";
import type { RouteParams } from "@/app/_lib/http";
import { liveSessions, type LiveSessionEvent } from "@/app/_lib/live/live-session-registry";

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

  return eventStreamResponse(
    request,
    (sink) => {
      const send = (event: LiveSessionEvent) => {
        sink.send(event.event, event.data);
        if (event.event === "ended") sink.close();
      };
      try {
        return liveSessions().watch(session, sessionId, send);
      } catch {
        // ended between the check above and here
        send({ event: "ended", data: { reason: "stopped" } });
        return () => {};
      }
    },
    { maxBehindBytes: MAX_BEHIND_BYTES },
  );
}
