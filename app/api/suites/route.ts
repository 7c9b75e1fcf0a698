import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, readJson, route } from "@/app/_lib/http";
import { createSuite, listSuites } from "@/db/queries/suites";
import { createSuiteBodySchema } from "./schema";
import { checkSuiteScenarios, suiteJson } from "./suite-json";

export const GET = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "scenarios.read");
  const suites = listSuites({ workspaceId: session.workspaceId });
  return json({ suites: suites.map((suite) => suiteJson(suite)) });
});

export const POST = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "suites.edit");
  const body = await readJson(request, createSuiteBodySchema);
  checkSuiteScenarios(session.workspaceId, body.scenarioIds);
  const suite = createSuite({
    values: {
      workspaceId: session.workspaceId,
      name: body.name,
      description: body.description ?? "",
      createdBy: session.userId,
    },
    scenarioIds: body.scenarioIds,
  });
  return json({ suite: suiteJson(suite, { scenarios: true }) }, { status: 201 });
});
