import type { Who } from "@/app/_lib/policy/policy";
import { readableSuiteScenarios, suiteCan } from "@/app/_lib/policy/suite";
import type { SuiteRow } from "@/db/queries/suites";

/** A suite as the API shows it; its scenarios only those the asking member may read. */
export function suiteJson(who: Who, suite: SuiteRow, options: { scenarios?: boolean } = {}) {
  return {
    id: suite.id,
    name: suite.name,
    description: suite.description,
    createdBy: suite.createdBy,
    createdAt: suite.createdAt.toISOString(),
    ...(options.scenarios
      ? {
          scenarios: readableSuiteScenarios(who, suite).map((scenario) => ({
            id: scenario.id,
            name: scenario.name,
            benchId: scenario.benchId,
          })),
        }
      : {}),
    can: suiteCan(who, suite),
  };
}
