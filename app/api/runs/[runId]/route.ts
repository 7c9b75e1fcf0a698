import { verifyApiSession } from "@/app/_lib/dal";
import { loadRun } from "@/app/_lib/policy/run";
import { AppError } from "@/app/_lib/errors";
import { json, route, type RouteParams } from "@/app/_lib/http";
import { resourceIdSchema } from "@/app/_lib/resources";
import { runJson } from "../run-json";

type Params = RouteParams<{ runId: string }>;

/** One run with its per-step results. */
export const GET = route(async (request, context: Params) => {
  const parsed = resourceIdSchema.safeParse((await context.params).runId);
  if (!parsed.success) throw new AppError("not_found", "no such run");
  const session = await verifyApiSession(request);
  return json({ run: runJson(loadRun(session, parsed.data), { results: true }) });
});
