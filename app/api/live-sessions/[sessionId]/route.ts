import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, route, type RouteParams } from "@/app/_lib/http";
import { liveSessions } from "@/app/_lib/live/live-session-registry";

type Params = RouteParams<{ sessionId: string }>;

/** One live session the member may see. */
export const GET = route(async (request, context: Params) => {
  const { sessionId } = await context.params;
  const session = await verifyApiSession(request);
  authorize(session, "console.use");
  return json({ session: liveSessions().view(session, sessionId) });
});

/** Stops a live session (its owner or an admin); its tunnels get a DISCONNECT_REQUEST. */
export const DELETE = route(async (request, context: Params) => {
  const { sessionId } = await context.params;
  const session = await verifyApiSession(request);
  authorize(session, "console.use");
  await liveSessions().stop(session, sessionId);
  return new Response(null, { status: 204, headers: { "Cache-Control": "no-store" } });
});
