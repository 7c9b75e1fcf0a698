import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { checkedName } from "@/app/_lib/names";
import { documentBodyLimitBytes, json, readJson, readQuery, route } from "@/app/_lib/http";
import { loadBench } from "@/app/_lib/policy/bench";
import { listReadableScenarios, loadBenchForNewScenario } from "@/app/_lib/policy/scenario";
import { checkedScenarioDocument } from "@/app/_lib/resources";
import { createScenario } from "@/db/queries/scenarios";
import { scenarioJson } from "./scenario-json";
import { createScenarioBodySchema, listScenariosQuerySchema, scenarioNameSchema } from "./schema";

/** Scenarios of the workspace on benches the member may see. */
export const GET = route(async (request) => {
  const query = readQuery(request, listScenariosQuerySchema);
  const session = await verifyApiSession(request);
  authorize(session, "scenarios.read");
  if (query.benchId !== undefined) loadBench(session, query.benchId, "read", { field: "benchId" });
  const scenarios = listReadableScenarios(
    session,
    query.benchId === undefined ? {} : { benchId: query.benchId },
  );
  return json({ scenarios: scenarios.map((scenario) => scenarioJson(scenario)) });
});

/** Create a scenario; an apprentice only on their own sandbox bench. */
export const POST = route(async (request) => {
  const session = await verifyApiSession(request);
  authorize(session, "scenarios.edit");
  const body = await readJson(request, createScenarioBodySchema, {
    limitBytes: documentBodyLimitBytes,
  });
  const bench = loadBenchForNewScenario(session, body.benchId, { field: "benchId" });
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
