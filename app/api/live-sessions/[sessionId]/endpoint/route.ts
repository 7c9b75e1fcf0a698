import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, route, type RouteParams } from "@/app/_lib/http";
import { liveSessions } from "@/app/_lib/live/live-session-registry";

type Params = RouteParams<{ sessionId: string }>;

/** Publishes the session on KNXnet/IP (its owner or an admin). */
export const POST = route(async (request, context: Params) => {
  const { sessionId } = await context.params;
  const session = await verifyApiSession(request);
  authorize(session, "console.use");
  return json({ session: await liveSessions().publish(session, sessionId) });
});

/** Takes the session off KNXnet/IP; every tunnel gets a DISCONNECT_REQUEST. */
export const DELETE = route(async (request, context: Params) => {
  const { sessionId } = await context.params;
  const session = await verifyApiSession(request);
  authorize(session, "console.use");
  return json({ session: await liveSessions().unpublish(session, sessionId) });
});
