import { z } from "zod";
import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, readJson, route, type RouteParams } from "@/app/_lib/http";
import { liveSessions } from "@/app/_lib/live/live-session-registry";

type Params = RouteParams<{ sessionId: string }>;

/**
 * POST /api/live-sessions/:id/commands: one command in the live console's
 * protocol (the engine's simCommandSchema checks it, naming the field). 202
 * once applied; its effects reach every viewer through the event stream.
 */
export const POST = route(async (request, context: Params) => {
  const { sessionId } = await context.params;
  const session = await verifyApiSession(request);
  authorize(session, "console.use");
  const command = await readJson(request, z.unknown());
  liveSessions().command(session, sessionId, command);
  return json({ ok: true }, { status: 202 });
});
