import type { Db } from "@/db/client";
import { getDb } from "@/db/client";
import { findRevisionInWorkspace } from "@/db/queries/bench-history";
import { latestRevision } from "@/db/queries/benches";
import {
  findRun,
  findSuiteRun,
  listRuns,
  type Run,
  type RunSummary,
  type SuiteRun,
} from "@/db/queries/runs";
import { can as roleCan, canOn, scopeOf } from "../capabilities";
import { AppError } from "../errors";
import { benchCan, loadBench } from "./bench";
import { loadScenario } from "./scenario";
import { loadSuite, suiteScenariosToRun } from "./suite";
import { type Can, forbidden, type IdSource, notFound, nothing, type Who } from "./policy";

/**
 * The run policy. Workspace scope reads every run of the workspace, "own" scope
 * (apprentices) only the runs they started; a run one may not read is "not
 * found", never told apart from one that does not exist. Reading a run is
 * enough to share its report by e-mail (the share route limits how often).
 * Starting a run: a scenario one may replay, on a revision of its bench or of a
 * copy of it that one may run; a suite only with workspace scope.
 */

export function runCan(who: Who, run: Pick<Run | SuiteRun, "workspaceId" | "startedBy">): Can {
  const scope = scopeOf(who.role, "runs.read");
  const read =
    run.workspaceId === who.workspaceId &&
    (scope === "workspace" || (scope === "own" && run.startedBy === who.userId));
  if (!read) return nothing;
  return { read: true, edit: false, run: false, share: true, delete: false };
}

/** One scenario run the session may read. */
export function loadRun(who: Who, runId: string, source: IdSource = {}): Run {
  if (!roleCan(who.role, "runs.read")) {
    throw forbidden(`your role (${who.role}) may not see runs`);
  }
  const run = findRun({ workspaceId: who.workspaceId, runId });
  if (!run || !runCan(who, run).read) throw notFound("run", source);
  return run;
}

/** A scenario run or a suite run (they share the /runs/:id address) the session may read. */
export function loadRunOrSuiteRun(
  who: Who,
  id: string,
  db: Db = getDb(),
): { kind: "scenario"; run: Run } | { kind: "suite"; suiteRun: SuiteRun } {
  if (!roleCan(who.role, "runs.read")) {
    throw forbidden(`your role (${who.role}) may not see runs`);
  }
  const run = findRun({ db, workspaceId: who.workspaceId, runId: id });
  if (run) {
    if (!runCan(who, run).read) throw notFound("run");
    return { kind: "scenario", run };
  }
  const suiteRun = findSuiteRun({ db, workspaceId: who.workspaceId, suiteRunId: id });
  if (suiteRun && runCan(who, suiteRun).read) return { kind: "suite", suiteRun };
  throw notFound("run");
}

/** The runs the session may read, newest first: all of the workspace's, or their own. */
export function listReadableRuns(who: Who, options: { limit?: number } = {}): RunSummary[] {
  const scope = scopeOf(who.role, "runs.read");
  if (scope === "none") return [];
  return listRuns({
    workspaceId: who.workspaceId,
    ...(scope === "workspace" ? {} : { startedBy: who.userId }),
    ...(options.limit === undefined ? {} : { limit: options.limit }),
  });
}

/** `startedBy` filter for run-history queries: undefined for workspace scope, else the session's user. */
export function ownRunsFilter(who: Who): string | undefined {
  return scopeOf(who.role, "runs.read") === "workspace" ? undefined : who.userId;
}

/**
 * The revision a scenario runs against: the one asked for, else the latest of
 * the scenario's bench. A revision asked for must be of a bench the session
 * may read, and that bench must be the scenario's bench or a copy made from it
 * (an apprentice's sandbox or lab copy).
 */
export function revisionForScenario(
  who: Who,
  scenarioBenchId: string,
  benchRevisionId: string | undefined,
  db: Db = getDb(),
) {
  const scenarioBench = loadBench(who, scenarioBenchId);
  if (benchRevisionId === undefined) {
    const latest = latestRevision({ db, benchId: scenarioBench.id });
    if (!latest) {
      throw new AppError("conflict", `bench "${scenarioBench.name}" has no saved revision`);
    }
    return { bench: scenarioBench, revision: latest };
  }
  const source = { field: "benchRevisionId" };
  const found = findRevisionInWorkspace({
    db,
    workspaceId: who.workspaceId,
    revisionId: benchRevisionId,
  });
  if (!found || !benchCan(who, found.bench).read) throw notFound("bench revision", source);
  const bench = found.bench;
  if (bench.id !== scenarioBench.id && bench.copiedFromBenchId !== scenarioBench.id) {
    throw new AppError(
      "invalid_input",
      `benchRevisionId: revision ${found.revision.number} belongs to bench "${bench.name}", which is neither "${scenarioBench.name}" (the scenario's bench) nor a copy of it`,
      source,
    );
  }
  return { bench, revision: found.revision };
}

/**
 * Everything a scenario replay needs, checked: the scenario (readable, else 404
 * on `scenarioId`), the revision (404 on `benchRevisionId`), and the right to
 * replay on that revision's bench ("own" scope: only on one's own copies).
 */
export function admitScenarioRun(
  who: Who,
  input: { scenarioId: string; benchRevisionId?: string | undefined },
) {
  const { scenario } = loadScenario(who, input.scenarioId, "read", { field: "scenarioId" });
  const { bench, revision } = revisionForScenario(who, scenario.benchId, input.benchRevisionId);
  if (!roleCan(who.role, "runs.start")) {
    throw forbidden(`your role (${who.role}) may not replay scenarios`);
  }
  if (!canOn(who, "runs.start", bench.privateOwnerId)) {
    throw forbidden(`your role (${who.role}) may replay scenarios only on your own copies`);
  }
  return { scenario, bench, revision };
}

/** A suite replay: the suite (404 on `suiteId`), workspace scope, and each scenario's revision. */
export function admitSuiteRun(
  who: Who,
  input: { suiteId: string; benchRevisionId?: string | undefined },
) {
  const suite = loadSuite(who, input.suiteId, "read", { field: "suiteId" });
  const scenarios = suiteScenariosToRun(who, suite, { field: "suiteId" });
  if (scenarios.length === 0) {
    throw new AppError("conflict", `suite "${suite.name}" has no scenarios`, { field: "suiteId" });
  }
  const entries = scenarios.map((scenario) => ({
    scenario,
    revision: revisionForScenario(who, scenario.benchId, input.benchRevisionId).revision,
  }));
  if (scopeOf(who.role, "runs.start") !== "workspace") {
    throw forbidden(`your role (${who.role}) may not replay suites`);
  }
  return { suite, entries };
}
