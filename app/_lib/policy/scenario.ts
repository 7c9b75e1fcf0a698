import type { Bench } from "@/db/queries/benches";
import { findBench } from "@/db/queries/benches";
import { findScenario, listScenarios, type ScenarioRow } from "@/db/queries/scenarios";
import { can as roleCan, canOn } from "../capabilities";
import { benchCan, listReadableBenches } from "./bench";
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
 * The scenario policy. A scenario is read by whoever may read its bench (so a
 * scenario on someone's private copy is as hidden as the copy); it is edited
 * and deleted workspace-wide or, with "own" scope, by its author; it is
 * replayed by those who may run its bench.
 */

export function scenarioCan(who: Who, scenario: ScenarioRow, bench: Bench | undefined): Can {
  if (
    scenario.workspaceId !== who.workspaceId ||
    !bench ||
    bench.id !== scenario.benchId ||
    !roleCan(who.role, "scenarios.read") ||
    !benchCan(who, bench).read
  ) {
    return nothing;
  }
  const edit = canOn(who, "scenarios.edit", scenario.createdBy);
  return {
    read: true,
    edit,
    run: canOn(who, "runs.start", bench.privateOwnerId),
    share: false,
    delete: edit,
  };
}

const refusals: Record<Action, string> = {
  read: "you may not open this scenario",
  edit: "your role may change only scenarios you wrote",
  run: "your role may replay scenarios only on your own copies",
  share: "scenarios are shared through their bench",
  delete: "your role may delete only scenarios you wrote",
};

/** Load a scenario (with its bench) for an action; 404 when not readable, 403 when not allowed. */
export function loadScenario(
  who: Who,
  scenarioId: string,
  action: Action = "read",
  source: IdSource = {},
): { scenario: ScenarioRow; bench: Bench } {
  const scenario = findScenario({ workspaceId: who.workspaceId, scenarioId });
  if (!scenario) throw notFound("scenario", source);
  const bench = findBench({ workspaceId: who.workspaceId, benchId: scenario.benchId });
  ensure(scenarioCan(who, scenario, bench), action, "scenario", refusals[action], source);
  return { scenario, bench: bench! };
}

/** Whether the session may read this scenario (for filtering lists that join scenarios). */
export function scenarioReadable(who: Who, scenario: ScenarioRow): boolean {
  const bench = findBench({ workspaceId: who.workspaceId, benchId: scenario.benchId });
  return scenarioCan(who, scenario, bench).read;
}

/** The scenarios the session may read, optionally of one bench, by name. */
export function listReadableScenarios(who: Who, options: { benchId?: string } = {}) {
  if (!roleCan(who.role, "scenarios.read")) return [];
  const readable = new Set(listReadableBenches(who).map((bench) => bench.id));
  return listScenarios({
    workspaceId: who.workspaceId,
    ...(options.benchId === undefined ? {} : { benchId: options.benchId }),
  }).filter((scenario) => readable.has(scenario.benchId));
}

/** Whether the session may add a scenario to this bench ("own" scope: only their own copies). */
export function mayAddScenarioTo(who: Who, bench: Bench): boolean {
  return benchCan(who, bench).read && canOn(who, "scenarios.edit", bench.privateOwnerId);
}

/**
 * The bench a new scenario goes onto: one the session may read, and with "own"
 * scope (apprentices) only their own private copy.
 */
export function loadBenchForNewScenario(who: Who, benchId: string, source: IdSource = {}): Bench {
  const bench = findBench({ workspaceId: who.workspaceId, benchId });
  if (!bench || !benchCan(who, bench).read) throw notFound("bench", source);
  const allowed: Can = { ...nothing, read: true, edit: mayAddScenarioTo(who, bench) };
  ensure(
    allowed,
    "edit",
    "bench",
    `your role (${who.role}) may add scenarios only to your own private copies`,
    source,
  );
  return bench;
}
