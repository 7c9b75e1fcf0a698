import type { ScenarioRow } from "@/db/queries/scenarios";

/** A scenario as the API returns it; the document only when asked. */
export function scenarioJson(scenario: ScenarioRow, options: { document?: boolean } = {}) {
  return {
    id: scenario.id,
    benchId: scenario.benchId,
    name: scenario.name,
    createdBy: scenario.createdBy,
    createdAt: scenario.createdAt.toISOString(),
    updatedAt: scenario.updatedAt.toISOString(),
    ...(options.document ? { document: JSON.parse(scenario.document) as unknown } : {}),
  };
}
