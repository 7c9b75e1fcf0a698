import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, readJson, route } from "@/app/_lib/http";
import { liveSessions } from "@/app/_lib/live/live-session-registry";
import { startLiveSessionBodySchema } from "./schema";

/** The server-hosted live sessions the member may see (their own; others' when they may watch). */
export const GET = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "console.use");
  return json({ sessions: liveSessions().list(session) });
});

/**
 * POST /api/live-sessions: start a live session of a bench revision on the
 * server, at real time. 201 with the session; 429 naming the limit when the
 * member or the workspace already runs as many as allowed.
 */
export const POST = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "console.use");
  const body = await readJson(request, startLiveSessionBodySchema);
  return json({ session: liveSessions().start(session, body) }, { status: 201 });
});
