import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, route, type RouteParams } from "@/app/_lib/http";
import { loadBench } from "@/app/_lib/policy/bench";
import { resourceIdSchema } from "@/app/_lib/resources";
import { listRevisions } from "@/db/queries/bench-history";

type Params = RouteParams<{ benchId: string }>;

/** The bench's revision history, newest first (numbers, authors with names, summaries; no documents). */
export const GET = route(async (request, context: Params) => {
  const parsed = resourceIdSchema.safeParse((await context.params).benchId);
  if (!parsed.success) throw new AppError("not_found", "no such bench");
  const session = await verifyApiSession(request);
  authorize(session, "benches.read");
  const bench = loadBench(session, parsed.data);
  const revisions = listRevisions({ benchId: bench.id }).map((revision) => ({
    ...revision,
    createdAt: revision.createdAt.toISOString(),
  }));
  return json({ revisions });
});
