import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, route, type RouteParams } from "@/app/_lib/http";
import { submitAttempt } from "@/app/_lib/labs/lab-service";

/**
 * POST /api/labs/assignments/:id/submit — submit the copy's latest revision;
 * the grading scenario runs on it in the run pool (202 with the run to follow).
 */
export const POST = route(async (request, context: RouteParams<{ assignmentId: string }>) => {
  const { assignmentId } = await context.params;
  const session = await verifyApiSession(request);
  authorize(session, "labs.read");
  const { attempt, run } = submitAttempt(session, assignmentId);
  return json(
    { attemptId: attempt.id, runId: run.id, eventsUrl: `/api/runs/${run.id}/events` },
    { status: 202 },
  );
});
