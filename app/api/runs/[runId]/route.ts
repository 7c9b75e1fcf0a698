import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, route, type RouteParams } from "@/app/_lib/http";
import { loadVisibleRun, resourceIdSchema } from "@/app/_lib/resources";
import { runJson } from "../run-json";

type Params = RouteParams<{ runId: string }>;

/** One run with its per-step results. */
export const GET = route(async (request, context: Params) => {
  const parsed = resourceIdSchema.safeParse((await context.params).runId);
  if (!parsed.success) throw new AppError("not_found", "no such run");
  const session = await verifyApiSession(request);
  authorize(session, "runs.read");
  return json({ run: runJson(loadVisibleRun(session, parsed.data), { results: true }) });
});
