import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, route, type RouteParams } from "@/app/_lib/http";
import { openAssignment } from "@/app/_lib/labs/lab-service";

/** POST /api/labs/assignments/:id/open — the apprentice's private copy, made on first use. */
export const POST = route(async (request, context: RouteParams<{ assignmentId: string }>) => {
  const { assignmentId } = await context.params;
  const session = await verifyApiSession(request);
  authorize(session, "labs.read");
  const opened = openAssignment(session, assignmentId);
  return json(opened, { status: opened.created ? 201 : 200 });
});
