import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { json, readJson, route } from "@/app/_lib/http";
import { checkSuiteScenarioIds, listReadableSuites } from "@/app/_lib/policy/suite";
import { createSuite } from "@/db/queries/suites";
import { createSuiteBodySchema } from "./schema";
import { suiteJson } from "./suite-json";

export const GET = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "scenarios.read");
  return json({ suites: listReadableSuites(session).map((suite) => suiteJson(session, suite)) });
});

export const POST = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "suites.edit");
  const body = await readJson(request, createSuiteBodySchema);
  checkSuiteScenarioIds(session, body.scenarioIds);
  const suite = createSuite({
    values: {
      workspaceId: session.workspaceId,
      name: body.name,
      description: body.description ?? "",
      createdBy: session.userId,
    },
    scenarioIds: body.scenarioIds,
  });
  return json({ suite: suiteJson(session, suite, { scenarios: true }) }, { status: 201 });
});
