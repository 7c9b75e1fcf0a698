import { can } from "@/app/_lib/capabilities";
import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { AppError } from "@/app/_lib/errors";
import { checkedName } from "@/app/_lib/names";
import { documentBodyLimitBytes, json, readJson, readQuery, route } from "@/app/_lib/http";
import { checkedScenarioDocument, loadVisibleBench } from "@/app/_lib/resources";
import { listVisibleBenches } from "@/db/queries/bench-history";
import { createScenario, listScenarios } from "@/db/queries/scenarios";
import { scenarioJson } from "./scenario-json";
import { createScenarioBodySchema, listScenariosQuerySchema, scenarioNameSchema } from "./schema";

/** Scenarios of the workspace on benches the member may see. */
export const GET = route(async (request) => {
  const query = readQuery(request, listScenariosQuerySchema);
  const session = await verifyApiSession(request);
  authorize(session, "scenarios.read");
  if (query.benchId !== undefined) loadVisibleBench(session, query.benchId);
  const visible = new Set(
    listVisibleBenches({
      workspaceId: session.workspaceId,
      userId: session.userId,
      includeAllPrivate: can(session.role, "labs.manage"),
    }).map((bench) => bench.id),
  );
  const scenarios = listScenarios({
    workspaceId: session.workspaceId,
    ...(query.benchId === undefined ? {} : { benchId: query.benchId }),
  }).filter((scenario) => visible.has(scenario.benchId));
  return json({ scenarios: scenarios.map((scenario) => scenarioJson(scenario)) });
});

/** Create a scenario; an apprentice only on their own sandbox bench. */
export const POST = route(async (request) => {
  const session = await verifyApiSession(request);
  const scope = authorize(session, "scenarios.edit");
  const body = await readJson(request, createScenarioBodySchema, {
    limitBytes: documentBodyLimitBytes,
  });
  const bench = loadVisibleBench(session, body.benchId);
  if (scope === "own" && bench.privateOwnerId !== session.userId) {
    throw new AppError(
      "forbidden",
      `your role (${session.role}) may add scenarios only to your own sandbox benches`,
      { field: "benchId" },
    );
  }
  const document = checkedScenarioDocument(body.document);
  const scenario = createScenario({
    values: {
      workspaceId: session.workspaceId,
      benchId: bench.id,
      name: body.name ?? checkedName(scenarioNameSchema, document.name, ["document", "name"]),
      document: document.text,
      createdBy: session.userId,
    },
  });
  return json({ scenario: scenarioJson(scenario, { document: true }) }, { status: 201 });
});
