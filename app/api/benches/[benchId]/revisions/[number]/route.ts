import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, route, type RouteParams } from "@/app/_lib/http";
import { loadBench } from "@/app/_lib/policy/bench";
import { resourceIdSchema } from "@/app/_lib/resources";
import { findRevision } from "@/db/queries/bench-history";
import { revisionJson } from "../../../bench-json";

type Params = RouteParams<{ benchId: string; number: string }>;

/** One earlier revision with its document. */
export const GET = route(async (request, context: Params) => {
  const params = await context.params;
  const benchId = resourceIdSchema.safeParse(params.benchId);
  const number = Number(params.number);
  if (!benchId.success || !Number.isInteger(number) || number < 1) {
    throw new AppError("not_found", "no such revision");
  }
  const session = await verifyApiSession(request);
  authorize(session, "benches.read");
  const bench = loadBench(session, benchId.data);
  const revision = findRevision({ benchId: bench.id, number });
  if (!revision) throw new AppError("not_found", "no such revision");
  return json({ revision: revisionJson(revision) });
});
