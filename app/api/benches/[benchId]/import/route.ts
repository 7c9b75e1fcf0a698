import { verifyApiSession } from "@/app/_lib/dal";
import { loadBench } from "@/app/_lib/policy/bench";
import { loadBenchForNewScenario } from "@/app/_lib/policy/scenario";
import { AppError } from "@/app/_lib/errors";
import { documentBodyLimitBytes, json, readJson, route, type RouteParams } from "@/app/_lib/http";
import { checkedName } from "@/app/_lib/names";
import { scenarioNameSchema } from "@/app/api/scenarios/schema";
import {
  checkedBenchDocument,
  checkedScenarioDocument,
  resourceIdSchema,
} from "@/app/_lib/resources";
import { saveRevision } from "@/db/queries/benches";
import { createScenario } from "@/db/queries/scenarios";
import { importBodySchema } from "./schema";

type Params = RouteParams<{ benchId: string }>;

/** Import a bench file as a new revision, or a scenario file onto this bench. */
export const POST = route(async (request, context: Params) => {
  const parsed = resourceIdSchema.safeParse((await context.params).benchId);
  if (!parsed.success) throw new AppError("not_found", "no such bench");
  const session = await verifyApiSession(request);
  // A bench this member cannot read is 404 before the body is read; what the
  // import may do to it depends on the file's kind, checked below.
  loadBench(session, parsed.data);
  const body = await readJson(request, importBodySchema, { limitBytes: documentBodyLimitBytes });
  if (body.kind === "bench") {
    const bench = loadBench(session, parsed.data, "edit");
    const document = checkedBenchDocument(body.document);
    const revision = saveRevision({
      benchId: bench.id,
      document: document.text,
      authorId: session.userId,
      summary: `Imported ${body.fileName}`.slice(0, 200),
    });
    return json(
      { kind: "bench", revision: { number: revision.number, id: revision.id } },
      { status: 201 },
    );
  }
  const bench = loadBenchForNewScenario(session, parsed.data);
  const document = checkedScenarioDocument(body.document);
  const scenario = createScenario({
    values: {
      workspaceId: session.workspaceId,
      benchId: bench.id,
      name: checkedName(scenarioNameSchema, document.name, ["document", "name"]),
      document: document.text,
      createdBy: session.userId,
    },
  });
  return json(
    { kind: "scenario", scenario: { id: scenario.id, name: scenario.name } },
    { status: 201 },
  );
});
