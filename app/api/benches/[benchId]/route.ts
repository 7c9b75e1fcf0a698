import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { loadBench } from "@/app/_lib/policy/bench";
import { AppError } from "@/app/_lib/errors";
import { documentBodyLimitBytes, json, readJson, route, type RouteParams } from "@/app/_lib/http";
import { checkedBenchDocument, resourceIdSchema } from "@/app/_lib/resources";
import { latestRevision, saveRevision } from "@/db/queries/benches";
import { archiveBench, updateBenchDetails } from "@/db/queries/bench-history";
import { benchView, revisionJson } from "../bench-json";
import { updateBenchBodySchema } from "./schema";

type Params = RouteParams<{ benchId: string }>;

async function benchIdOf(context: Params) {
  const parsed = resourceIdSchema.safeParse((await context.params).benchId);
  if (!parsed.success) throw new AppError("not_found", "no such bench");
  return parsed.data;
}

/** A bench with its latest revision's document. */
export const GET = route(async (request, context: Params) => {
  const benchId = await benchIdOf(context);
  const session = await verifyApiSession(request);
  authorize(session, "benches.read");
  const bench = loadBench(session, benchId);
  const revision = latestRevision({ benchId: bench.id });
  return json({
    bench: benchView(session, bench),
    revision: revision ? revisionJson(revision) : null,
  });
});

/** Rename and/or save a new revision (the history keeps every earlier one). */
export const PATCH = route(async (request, context: Params) => {
  const benchId = await benchIdOf(context);
  const session = await verifyApiSession(request);
  const bench = loadBench(session, benchId, "edit");
  const body = await readJson(request, updateBenchBodySchema, {
    limitBytes: documentBodyLimitBytes,
  });
  const document = body.document === undefined ? null : checkedBenchDocument(body.document);
  if (body.baseRevision !== undefined) {
    const latest = latestRevision({ benchId: bench.id });
    if (latest && latest.number !== body.baseRevision) {
      throw new AppError(
        "conflict",
        `the bench was saved as revision ${latest.number} since you opened revision ${body.baseRevision}; reload it first`,
        { field: "baseRevision" },
      );
    }
  }
  let updated = bench;
  if (body.name !== undefined || body.description !== undefined) {
    updated =
      updateBenchDetails({
        workspaceId: session.workspaceId,
        benchId: bench.id,
        values: {
          ...(body.name === undefined ? {} : { name: body.name }),
          ...(body.description === undefined ? {} : { description: body.description }),
        },
      }) ?? bench;
  }
  const revision = document
    ? saveRevision({
        benchId: bench.id,
        document: document.text,
        authorId: session.userId,
        summary: body.summary ?? "",
      })
    : latestRevision({ benchId: bench.id });
  return json({
    bench: benchView(session, updated),
    revision: revision ? { number: revision.number, id: revision.id } : null,
  });
});

/** Archive a bench: gone from lists and 404 from now on; runs keep their revisions. */
export const DELETE = route(async (request, context: Params) => {
  const benchId = await benchIdOf(context);
  const session = await verifyApiSession(request);
  const bench = loadBench(session, benchId, "delete");
  archiveBench({ workspaceId: session.workspaceId, benchId: bench.id });
  return new Response(null, { status: 204, headers: { "Cache-Control": "no-store" } });
});
