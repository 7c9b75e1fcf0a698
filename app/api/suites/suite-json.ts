import { AppError } from "@/app/_lib/errors";
import { findScenario } from "@/db/queries/scenarios";
import { listSuiteScenarios, type SuiteRow } from "@/db/queries/suites";

export function suiteJson(suite: SuiteRow, options: { scenarios?: boolean } = {}) {
  return {
    id: suite.id,
    name: suite.name,
    description: suite.description,
    createdBy: suite.createdBy,
    createdAt: suite.createdAt.toISOString(),
    ...(options.scenarios
      ? {
          scenarios: listSuiteScenarios({ suiteId: suite.id }).map(({ scenario }) => ({
            id: scenario.id,
            name: scenario.name,
            benchId: scenario.benchId,
          })),
        }
      : {}),
  };
}

/** Every id must be a scenario of this workspace; another workspace's id is "not found". */
export function checkSuiteScenarios(workspaceId: string, scenarioIds: readonly string[]) {
  scenarioIds.forEach((scenarioId, index) => {
    if (!findScenario({ workspaceId, scenarioId })) {
      throw new AppError("not_found", `scenarioIds[${index}]: no such scenario`, {
        field: `scenarioIds[${index}]`,
      });
    }
  });
}
