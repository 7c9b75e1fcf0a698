import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, readJson, route, type RouteParams } from "@/app/_lib/http";
import { loadBench } from "@/app/_lib/policy/bench";
import { resourceIdSchema } from "@/app/_lib/resources";
import { latestRevision } from "@/db/queries/benches";
import { duplicateBench } from "@/db/queries/bench-history";
import { benchView } from "../../bench-json";
import { duplicateBenchBodySchema } from "./schema";

type Params = RouteParams<{ benchId: string }>;

/** Copy a bench the member may see into a new bench (shared, or a private sandbox copy). */
export const POST = route(async (request, context: Params) => {
  const parsed = resourceIdSchema.safeParse((await context.params).benchId);
  if (!parsed.success) throw new AppError("not_found", "no such bench");
  const session = await verifyApiSession(request);
  const scope = authorize(session, "benches.edit");
  const source = loadBench(session, parsed.data, "share");
  const body = await readJson(request, duplicateBenchBodySchema);
  const revision = latestRevision({ benchId: source.id });
  if (!revision) throw new AppError("conflict", "the bench has no revision to copy");
  const makePrivate = scope === "own" || body.private === true;
  const copy = duplicateBench({
    source,
    document: revision.document,
    name: body.name ?? `${source.name} (copy)`,
    createdBy: session.userId,
    privateOwnerId: makePrivate ? session.userId : null,
  });
  return json(
    { bench: benchView(session, copy.bench), revision: { number: copy.revision.number } },
    { status: 201 },
  );
});
