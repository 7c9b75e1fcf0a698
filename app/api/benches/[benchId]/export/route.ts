import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { route, type RouteParams } from "@/app/_lib/http";
import { loadBench } from "@/app/_lib/policy/bench";
import { resourceIdSchema } from "@/app/_lib/resources";
import { latestRevision } from "@/db/queries/benches";

type Params = RouteParams<{ benchId: string }>;

/** The latest saved revision as a downloadable bench file in Benchline's own format. */
export const GET = route(async (request, context: Params) => {
  const parsed = resourceIdSchema.safeParse((await context.params).benchId);
  if (!parsed.success) throw new AppError("not_found", "no such bench");
  const session = await verifyApiSession(request);
  authorize(session, "benches.read");
  const bench = loadBench(session, parsed.data);
  const revision = latestRevision({ benchId: bench.id });
  if (!revision) throw new AppError("not_found", "the bench has no saved revision");
  const fileName = `${bench.name.replace(/[^\w.-]+/g, "-").toLowerCase() || "bench"}.bench.json`;
  return new Response(`${JSON.stringify(JSON.parse(revision.document), null, 2)}\n`, {
    headers: {
      "Content-Type": "application/json; charset=utf-8",
      "Content-Disposition": `attachment; filename="${fileName}"`,
      "Cache-Control": "no-store",
    },
  });
});
