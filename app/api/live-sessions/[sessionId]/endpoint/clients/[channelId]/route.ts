import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { route, type RouteParams } from "@/app/_lib/http";
import { liveSessions } from "@/app/_lib/live/live-session-registry";

type Params = RouteParams<{ sessionId: string; channelId: string }>;

/** Disconnects one tunnel of a published session (DISCONNECT_REQUEST to its client). */
export const DELETE = route(async (request, context: Params) => {
  const { sessionId, channelId: channelText } = await context.params;
  const channelId = Number(channelText);
  if (!/^\d{1,3}$/.test(channelText) || channelId < 1 || channelId > 255)
    throw new AppError("not_found", "no such tunnel client");
  const session = await verifyApiSession(request);
  authorize(session, "console.use");
  liveSessions().disconnectClient(session, sessionId, channelId);
  return new Response(null, { status: 204, headers: { "Cache-Control": "no-store" } });
});
