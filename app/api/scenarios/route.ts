import { authorize, verifyApiSession } from "@/app/_lib/dal";
import { documentBodyLimitBytes, json, readJson, readQuery, route } from "@/app/_lib/http";
import { loadBench } from "@/app/_lib/policy/bench";
import { listReadableScenarios, loadBenchForNewScenario } from "@/app/_lib/policy/scenario";
import { checkedScenarioDocument } from "@/app/_lib/resources";
import { createScenario } from "@/db/queries/scenarios";
import { scenarioJson } from "./scenario-json";
import { createScenarioBodySchema, listScenariosQuerySchema } from "./schema";

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
  const body = await readJson(request, createScenarioBodySchema, {
    limitBytes: documentBodyLimitBytes,
  });
  const session = await verifyApiSession(request);
  authorize(session, "scenarios.edit");
  const bench = loadBenchForNewScenario(session, body.benchId, { field: "benchId" });
  const document = checkedScenarioDocument(body.document);
  const scenario = createScenario({
    values: {
      workspaceId: session.workspaceId,
      benchId: bench.id,
      name: body.name ?? document.name,
      document: document.text,
      createdBy: session.userId,
    },
  });
  return json({ scenario: scenarioJson(scenario, { document: true }) }, { status: 201 });
});
