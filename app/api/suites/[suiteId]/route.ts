import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { json, readJson, route, type RouteParams } from "@/app/_lib/http";
import { checkSuiteScenarioIds, loadSuite } from "@/app/_lib/policy/suite";
import { resourceIdSchema } from "@/app/_lib/resources";
import { deleteSuite, updateSuite } from "@/db/queries/suites";
import { suiteJson } from "../suite-json";
import { updateSuiteBodySchema } from "./schema";

type Params = RouteParams<{ suiteId: string }>;

async function suiteIdOf(context: Params) {
  const parsed = resourceIdSchema.safeParse((await context.params).suiteId);
  if (!parsed.success) throw new AppError("not_found", "no such suite");
  return parsed.data;
}

export const GET = route(async (request, context: Params) => {
  const suiteId = await suiteIdOf(context);
  const session = await verifyApiSession(request);
  authorize(session, "scenarios.read");
  return json({ suite: suiteJson(session, loadSuite(session, suiteId), { scenarios: true }) });
});

export const PATCH = route(async (request, context: Params) => {
  const suiteId = await suiteIdOf(context);
  const session = await verifyApiSession(request);
  const suite = loadSuite(session, suiteId, "edit");
  const body = await readJson(request, updateSuiteBodySchema);
  if (body.scenarioIds) checkSuiteScenarioIds(session, body.scenarioIds);
  const updated = updateSuite({
    workspaceId: session.workspaceId,
    suiteId: suite.id,
    values: {
      ...(body.name === undefined ? {} : { name: body.name }),
      ...(body.description === undefined ? {} : { description: body.description }),
    },
    ...(body.scenarioIds === undefined ? {} : { scenarioIds: body.scenarioIds }),
  });
  if (!updated) throw new AppError("not_found", "no such suite");
  return json({ suite: suiteJson(session, updated, { scenarios: true }) });
});

export const DELETE = route(async (request, context: Params) => {
  const suiteId = await suiteIdOf(context);
  const session = await verifyApiSession(request);
  const suite = loadSuite(session, suiteId, "delete");
  deleteSuite({ workspaceId: session.workspaceId, suiteId: suite.id });
  return new Response(null, { status: 204, headers: { "Cache-Control": "no-store" } });
});
