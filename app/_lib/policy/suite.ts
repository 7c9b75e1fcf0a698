import type { Bench } from "@/db/queries/benches";
import type { ScenarioRow } from "@/db/queries/scenarios";
import { findSuite, listSuiteScenarios, listSuites, type SuiteRow } from "@/db/queries/suites";
import { can as roleCan } from "../capabilities";
import { AppError } from "../errors";
import { loadScenario, scenarioReadable } from "./scenario";
import {
  type Action,
  type Can,
  ensure,
  type IdSource,
  notFound,
  nothing,
  type Who,
} from "./policy";

/**
 * The suite policy. A suite is shared with the whole workspace: everyone who
 * reads scenarios reads it, those who hold "suites.edit" change it, those who
 * replay workspace-wide run it. Because every reader sees its list, a suite
 * takes only scenarios the author may read on shared benches, and a reader is
 * shown only the scenarios they may read.
 */

export function suiteCan(who: Who, suite: SuiteRow): Can {
  if (suite.workspaceId !== who.workspaceId || !roleCan(who.role, "scenarios.read")) {
    return nothing;
  }
  const edit = roleCan(who.role, "suites.edit");
  return {
    read: true,
    edit,
    run: roleCan(who.role, "runs.start", { scope: "workspace" }),
    share: false,
    delete: edit,
  };
}

const refusals: Record<Action, string> = {
  read: "you may not open this suite",
  edit: "your role may not change suites",
  run: "your role may not replay suites",
  share: "suites are shared with the whole workspace",
  delete: "your role may not delete suites",
};

export function loadSuite(
  who: Who,
  suiteId: string,
  action: Action = "read",
  source: IdSource = {},
): SuiteRow {
  const suite = findSuite({ workspaceId: who.workspaceId, suiteId });
  if (!suite) throw notFound("suite", source);
  ensure(suiteCan(who, suite), action, "suite", refusals[action], source);
  return suite;
}

export function listReadableSuites(who: Who): SuiteRow[] {
  if (!roleCan(who.role, "scenarios.read")) return [];
  return listSuites({ workspaceId: who.workspaceId });
}

/** The suite's scenarios in order, only those the session may read. */
export function readableSuiteScenarios(who: Who, suite: SuiteRow): ScenarioRow[] {
  return listSuiteScenarios({ suiteId: suite.id })
    .map(({ scenario }) => scenario)
    .filter((scenario) => scenarioReadable(who, scenario));
}

/**
 * Check the scenario ids of a suite body: each must be a scenario the session
 * may read (404 naming `scenarioIds[i]` otherwise, never its name or bench),
 * on a shared bench (400), since every reader of the suite will see it.
 */
export function checkSuiteScenarioIds(
  who: Who,
  scenarioIds: readonly string[],
): { scenario: ScenarioRow; bench: Bench }[] {
  return scenarioIds.map((scenarioId, index) => {
    const field = `scenarioIds[${index}]`;
    const loaded = loadScenario(who, scenarioId, "read", { field });
    if (loaded.bench.privateOwnerId !== null) {
      throw new AppError(
        "invalid_input",
        `${field}: that scenario is on a private copy; a suite is shared with the whole workspace, so it takes only scenarios on shared benches`,
        { field },
      );
    }
    return loaded;
  });
}

/**
 * The suite's scenarios for a replay: every one must still be readable by the
 * session (a suite row written before this rule may hold others).
 */
export function suiteScenariosToRun(who: Who, suite: SuiteRow, source: IdSource = {}) {
  return listSuiteScenarios({ suiteId: suite.id }).map(({ scenario }) => {
    if (!scenarioReadable(who, scenario)) {
      throw new AppError(
        "conflict",
        `${source.field ? `${source.field}: ` : ""}the suite holds a scenario you may not open; ask its author to take it out`,
        source.field ? { field: source.field } : undefined,
      );
    }
    return scenario;
  });
}
